#include "flapline/case/exponential_stepper.hpp"

#include <algorithm>
#include <array>
#include <cassert>
#include <cmath>

namespace flapline {
namespace {

constexpr int kTerms = 27;  // Taylor terms for |x| < 2: 2²⁷/27! < 1e-19

/// Taylor coefficients of φ₁, φ₂, φ₃ and of f₁, f₂, f₃: Σ c_m x^m.
struct Series {
  std::array<double, kTerms> phi1{}, phi2{}, phi3{}, f1{}, f2{}, f3{};
  Series() {
    // 1/(m + k)! for k = 1, 2, 3
    double fact = 1.0;  // m!
    for (int m = 0; m < kTerms; ++m) {
      if (m > 0) fact *= m;
      const double i1 = 1.0 / (fact * (m + 1)), i2 = i1 / (m + 2), i3 = i2 / (m + 3);
      phi1[static_cast<std::size_t>(m)] = i1;
      phi2[static_cast<std::size_t>(m)] = i2;
      phi3[static_cast<std::size_t>(m)] = i3;
      f1[static_cast<std::size_t>(m)] = i1 - 3.0 * i2 + 4.0 * i3;
      f2[static_cast<std::size_t>(m)] = i2 - 2.0 * i3;
      f3[static_cast<std::size_t>(m)] = -i2 + 4.0 * i3;
    }
  }
};
const Series& series() {
  static const Series s;
  return s;
}

/// Terms needed for |x| below 0.01, 0.125, 0.5, 2 (remainder below 1e-17 of the leading term).
int terms_for(double ax) {
  return ax < 0.01 ? 7 : ax < 0.125 ? 10 : ax < 0.5 ? 15 : kTerms;
}

double horner(const std::array<double, kTerms>& c, int terms, double x) {
  double s = c[static_cast<std::size_t>(terms - 1)];
  for (int m = terms - 2; m >= 0; --m) s = s * x + c[static_cast<std::size_t>(m)];
  return s;
}

}  // namespace

void phi_functions(double x, double& phi1, double& phi2, double& phi3) {
  const double ax = std::abs(x);
  if (ax < 2.0) {
    const Series& s = series();
    const int n = terms_for(ax);
    phi1 = horner(s.phi1, n, x);
    phi2 = horner(s.phi2, n, x);
    phi3 = horner(s.phi3, n, x);
    return;
  }
  const double em1 = std::expm1(x);
  phi1 = em1 / x;
  phi2 = (em1 - x) / (x * x);
  phi3 = (em1 - x - 0.5 * x * x) / (x * x * x);
}

EtdWeights etd_weights(double z) {
  EtdWeights w;
  const double half = 0.5 * z;
  w.e_half = std::exp(half);
  w.e_full = w.e_half * w.e_half;
  const Series& s = series();
  if (std::abs(half) < 2.0)
    w.q = 0.5 * horner(s.phi1, terms_for(std::abs(half)), half);
  else
    w.q = 0.5 * std::expm1(half) / half;
  if (std::abs(z) < 2.0) {
    const int n = terms_for(std::abs(z));
    w.f1 = horner(s.f1, n, z);
    w.f2 = horner(s.f2, n, z);
    w.f3 = horner(s.f3, n, z);
  } else {
    // Cox & Matthews (2002) eq. 26 over h: z⁻³[−4 − z + eᶻ(4 − 3z + z²)], z⁻³[2 + z + eᶻ(z − 2)],
    // z⁻³[−4 − 3z − z² + eᶻ(4 − z)]; for |z| ≥ 2 the cancellation costs at most a few ulp.
    const double e = w.e_full, z3 = z * z * z;
    w.f1 = (-4.0 - z + e * (4.0 - 3.0 * z + z * z)) / z3;
    w.f2 = (2.0 + z + e * (z - 2.0)) / z3;
    w.f3 = (-4.0 - 3.0 * z - z * z + e * (4.0 - z)) / z3;
  }
  return w;
}

void ExponentialStepper::resize(Eigen::Index strips, Eigen::Index phases) {
  n_ = strips;
  for (Eigen::ArrayXd* a : {&mu1_, &mu2_,       &v11_, &v12_, &v21_, &v22_, &w11_, &w12_, &w21_,
                            &w22_, &mean_rate_, &y1_,  &y2_,  &a1_,  &a2_,  &b1_,  &b2_,  &c1_,
                            &c2_,  &nu1_,       &nu2_, &na1_, &na2_, &nb1_, &nb2_, &nc1_, &nc2_})
    a->setZero(strips);
  stage_.setZero(2 * strips);
  f_.setZero(2 * strips);
  own_.setZero(strips, 12);
  z_.setZero(strips);
  t1_.setZero(strips);
  cache_.reserve(static_cast<std::size_t>(phases * strips * 12));
  filled_.assign(static_cast<std::size_t>(phases), 0);
}

void ExponentialStepper::set_linear_part(const WagnerCoefficients& w,
                                         const Eigen::Ref<const Eigen::ArrayXd>& kappa) {
  assert(kappa.size() == n_ && "resize the stepper before setting its linear part");
  diagonal_ = (kappa == 0.0).all();
  for (Eigen::Index i = 0; i < n_; ++i) {
    const double k = kappa(i);
    const double a = w.b1 * (w.a1 * k - 1.0), b = w.b1 * w.a1 * k;
    const double c = w.b2 * w.a2 * k, d = w.b2 * (w.a2 * k - 1.0);
    if (b * c <= 0.0) {  // diagonal (κ = 0), or off-diagonal terms left explicit
      mu1_(i) = a;
      mu2_(i) = d;
      v11_(i) = v22_(i) = w11_(i) = w22_(i) = 1.0;
      v12_(i) = v21_(i) = w12_(i) = w21_(i) = 0.0;
      continue;
    }
    // Real distinct eigenvalues m ± r; eigenvectors chosen free of cancellation.
    const double m = 0.5 * (a + d), r = std::sqrt(0.25 * (a - d) * (a - d) + b * c);
    mu1_(i) = m + r;
    mu2_(i) = m - r;
    double p, q, s, u;  // V = [p s; q u]
    if (a >= d) {
      p = mu1_(i) - d, q = c;  // (L − μ₁)v = 0 from the second row
      s = b, u = mu2_(i) - a;  // from the first row
    } else {
      p = b, q = mu1_(i) - a;
      s = mu2_(i) - d, u = c;
    }
    const double det = p * u - s * q;
    v11_(i) = p, v21_(i) = q, v12_(i) = s, v22_(i) = u;
    w11_(i) = u / det, w12_(i) = -s / det, w21_(i) = -q / det, w22_(i) = p / det;
  }
}

void ExponentialStepper::weights(double h, Eigen::Index phase) {
  const bool cached = phase >= 0 && phase < static_cast<Eigen::Index>(filled_.size());
  if (cached && filled_[static_cast<std::size_t>(phase)]) {
    w_ = cache_.reserve(0) + phase * n_ * 12;
    return;
  }
  double* block = cached ? cache_.reserve(0) + phase * n_ * 12 : own_.data();
  w_ = block;
  Eigen::Map<Eigen::ArrayXXd> c(block, n_, 12);
  // etd_weights for all strips at once: the Taylor series below |z| = 0.5 (at most 15 terms,
  // fewer when every |z| is small; remainder < 1e-17), the closed forms above (cancellation below
  // 300 ulp at |z| = 0.5).
  const Series& sr = series();
  for (int m = 0; m < 2; ++m) {
    z_ = h * mean_rate_ * (m == 0 ? mu1_ : mu2_);
    const double largest = z_.abs().maxCoeff();
    auto e_half = c.col(6 * m + 0), e_full = c.col(6 * m + 1), q = c.col(6 * m + 2),
         f1 = c.col(6 * m + 3), f2 = c.col(6 * m + 4), f3 = c.col(6 * m + 5);
    e_half = (0.5 * z_).exp();
    e_full = e_half * e_half;
    const bool all_small = largest < 0.5;
    if (!all_small) {  // closed forms (Cox & Matthews 2002, eq. 26, over h)
      t1_ = z_ * z_ * z_;
      f1 = (-4.0 - z_ + e_full * (4.0 - 3.0 * z_ + z_ * z_)) / t1_;
      f2 = (2.0 + z_ + e_full * (z_ - 2.0)) / t1_;
      f3 = (-4.0 - 3.0 * z_ - z_ * z_ + e_full * (4.0 - z_)) / t1_;
      q = (e_half - 1.0) / z_;
    }
    const int terms = all_small ? std::min(terms_for(largest), 15) : 15;
    for (Eigen::Index i = 0; i < n_; ++i) {  // the four series in one pass (Horner)
      const double z = z_(i), x = 0.5 * z;
      if (!all_small && std::abs(z) >= 0.5) continue;
      double a1 = sr.f1[static_cast<std::size_t>(terms - 1)];
      double a2 = sr.f2[static_cast<std::size_t>(terms - 1)];
      double a3 = sr.f3[static_cast<std::size_t>(terms - 1)];
      double a4 = sr.phi1[static_cast<std::size_t>(terms - 1)];
      for (int k = terms - 2; k >= 0; --k) {
        const std::size_t u = static_cast<std::size_t>(k);
        a1 = a1 * z + sr.f1[u];
        a2 = a2 * z + sr.f2[u];
        a3 = a3 * z + sr.f3[u];
        a4 = a4 * x + sr.phi1[u];
      }
      f1(i) = a1, f2(i) = a2, f3(i) = a3, q(i) = 0.5 * a4;
    }
    f1 *= h, f2 *= h, f3 *= h, q *= h;
  }
  if (cached) filled_[static_cast<std::size_t>(phase)] = 1;
}

void ExponentialStepper::to_modes(const Eigen::VectorXd& x, Eigen::ArrayXd& y1,
                                  Eigen::ArrayXd& y2) const {
  const auto x1 = x.head(n_).array(), x2 = x.tail(n_).array();
  if (diagonal_) {
    y1 = x1;
    y2 = x2;
    return;
  }
  y1 = w11_ * x1 + w12_ * x2;
  y2 = w21_ * x1 + w22_ * x2;
}

void ExponentialStepper::from_modes(const Eigen::ArrayXd& y1, const Eigen::ArrayXd& y2,
                                    Eigen::VectorXd& x) const {
  if (diagonal_) {
    x.head(n_) = y1.matrix();
    x.tail(n_) = y2.matrix();
    return;
  }
  x.head(n_).array() = v11_ * y1 + v12_ * y2;
  x.tail(n_).array() = v21_ * y1 + v22_ * y2;
}

void ExponentialStepper::remainder(const Eigen::ArrayXd& y1, const Eigen::ArrayXd& y2,
                                   Eigen::ArrayXd& n1, Eigen::ArrayXd& n2) const {
  const auto f1 = f_.head(n_).array(), f2 = f_.tail(n_).array();
  if (diagonal_) {
    n1 = f1 - mean_rate_ * mu1_ * y1;
    n2 = f2 - mean_rate_ * mu2_ * y2;
    return;
  }
  n1 = w11_ * f1 + w12_ * f2 - mean_rate_ * mu1_ * y1;
  n2 = w21_ * f1 + w22_ * f2 - mean_rate_ * mu2_ * y2;
}

double ExponentialStepper::explicit_gain(const Eigen::Ref<const Eigen::ArrayXd>& rate0,
                                         const Eigen::Ref<const Eigen::ArrayXd>& rate_half,
                                         const Eigen::Ref<const Eigen::ArrayXd>& rate1,
                                         double h) const {
  const Eigen::ArrayXd mean = (rate0 + 4.0 * rate_half + rate1) / 6.0;
  const Eigen::ArrayXd spread =
      (rate0 - mean).abs().max((rate_half - mean).abs()).max((rate1 - mean).abs());
  const Eigen::ArrayXd mu = mu1_.abs().max(mu2_.abs());
  return (h * spread * mu / (h * mean * mu).max(1.0)).maxCoeff();
}

}  // namespace flapline
