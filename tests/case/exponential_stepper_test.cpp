// Exponential time differencing of the lag states (simulation.integrator: exponential) against
// analytic solutions and against the φ-functions computed another way.
#include <doctest/doctest.h>

#include <Eigen/Eigenvalues>
#include <cmath>
#include <complex>

#include "flapline/case/exponential_stepper.hpp"
#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/samples/samples.hpp"
#include "flapline/simulation/integrate.hpp"

using namespace flapline;

namespace {

/// φ_k(x) by the contour mean of Kassam & Trefethen (2005, SIAM J. Sci. Comput. 26, eq. 2.1 and
/// section 3): the average of φ_k over 64 points on a circle of radius 1 around x, each point
/// evaluated with the closed form (no cancellation there). Exact for analytic φ up to
/// exponentially small terms.
double contour_phi(int k, double x) {
  const int m = 64;
  std::complex<double> sum = 0.0;
  for (int j = 0; j < m; ++j) {
    const std::complex<double> z =
        x + std::exp(std::complex<double>(0.0, kPi * (j + 0.5) / (m / 2.0)));
    const std::complex<double> e = std::exp(z);
    std::complex<double> v;
    if (k == 1) v = (e - 1.0) / z;
    if (k == 2) v = (e - 1.0 - z) / (z * z);
    if (k == 3) v = (e - 1.0 - z - 0.5 * z * z) / (z * z * z);
    sum += v;
  }
  return (sum / static_cast<double>(m)).real();
}

}  // namespace

TEST_CASE("phi-functions agree with the Kassam-Trefethen contour mean across the branch switch") {
  for (double x : {-1e-12, -1e-6, -0.01, -0.124, -0.126, -0.49, -0.51, -1.0, -1.99, -2.0, -2.01,
                   -3.0, -10.0, -50.0, -400.0, 0.0, 0.3, 1.5, 2.5}) {
    CAPTURE(x);
    double p1, p2, p3;
    phi_functions(x, p1, p2, p3);
    CHECK(p1 == doctest::Approx(contour_phi(1, x)).epsilon(1e-13));
    CHECK(p2 == doctest::Approx(contour_phi(2, x)).epsilon(1e-13));
    CHECK(p3 == doctest::Approx(contour_phi(3, x)).epsilon(1e-13));
  }
  // Limits (analytic): φ_k(0) = 1/k!.
  double p1, p2, p3;
  phi_functions(0.0, p1, p2, p3);
  CHECK(p1 == 1.0);
  CHECK(p2 == 0.5);
  CHECK(p3 == doctest::Approx(1.0 / 6.0).epsilon(1e-16));
  // The ETDRK4 weights (Cox & Matthews 2002, eq. 26) from the φ-functions.
  for (double z : {-1e-3, -0.7, -1.99, -2.01, -8.0, -300.0}) {
    CAPTURE(z);
    const EtdWeights w = etd_weights(z);
    phi_functions(z, p1, p2, p3);
    CHECK(w.f1 == doctest::Approx(p1 - 3 * p2 + 4 * p3).epsilon(1e-12));
    CHECK(w.f2 == doctest::Approx(p2 - 2 * p3).epsilon(1e-12));
    CHECK(w.f3 == doctest::Approx(-p2 + 4 * p3).epsilon(1e-12));
    double q1, q2, q3;
    phi_functions(0.5 * z, q1, q2, q3);
    CHECK(w.q == doctest::Approx(0.5 * q1).epsilon(1e-15));
    CHECK(w.e_full == doctest::Approx(std::exp(z)).epsilon(1e-15));
  }
}

TEST_CASE("the stepper's weights for all strips equal etd_weights strip by strip") {
  const WagnerCoefficients w = wagner_coefficients(WagnerFit::rt_jones);
  const Eigen::ArrayXd kappa = (Eigen::ArrayXd(6) << 0.0, -0.1, -0.5, -0.9, -1.5, -3.0).finished();
  // Rates spanning both branches (|z| from 1e-7 to 300 across the two modes).
  const Eigen::ArrayXd rate =
      (Eigen::ArrayXd(6) << 1e-3, 40.0, 160.0, 330.0, 2000.0, 3e5).finished();
  ExponentialStepper st;
  st.resize(6, 0);
  st.set_linear_part(w, kappa);
  Eigen::VectorXd x = Eigen::VectorXd::Zero(12);
  const double h = 0.01;
  st.step([](const Eigen::VectorXd&, double, Eigen::VectorXd& d) { d.setZero(12); }, x, 0.0, h,
          rate, rate, rate, -1);
  const Eigen::ArrayXXd& c = st.last_weights();
  for (Eigen::Index i = 0; i < 6; ++i) {
    // The strip's eigenvalues (analytic, 2×2): m ± r.
    const double k = kappa(i), a = w.b1 * (w.a1 * k - 1), b = w.b1 * w.a1 * k;
    const double cc = w.b2 * w.a2 * k, d = w.b2 * (w.a2 * k - 1);
    const double m = 0.5 * (a + d), r = std::sqrt(0.25 * (a - d) * (a - d) + b * cc);
    for (int mode = 0; mode < 2; ++mode) {
      const double z = h * rate(i) * (mode == 0 ? m + r : m - r);
      CAPTURE(z);
      const EtdWeights e = etd_weights(z);
      const double expected[6] = {e.e_half, e.e_full, h * e.q, h * e.f1, h * e.f2, h * e.f3};
      for (int j = 0; j < 6; ++j)
        CHECK(c(i, 6 * mode + j) == doctest::Approx(expected[j]).epsilon(1e-13));
    }
  }
}

TEST_CASE("one strip, constant forcing, step x rate = 50: the exact equilibrium") {
  // dx_k/dt = σ b_k (A_k g − x_k) (analytic equilibrium x_k = A_k g); with κ ≠ 0 the strip's own
  // 2×2 block σ(Lx + b∘A g): equilibrium x = −L⁻¹(b∘A g).
  const WagnerCoefficients w = wagner_coefficients(WagnerFit::rt_jones);
  const double g = 0.7, sigma = 50.0 / (w.b2 * 0.01), h = 0.01;  // h σ b₂ = 50
  for (double kappa : {0.0, -0.8}) {
    CAPTURE(kappa);
    ExponentialStepper st;
    st.resize(1, 0);
    st.set_linear_part(w, Eigen::ArrayXd::Constant(1, kappa));
    Eigen::Matrix2d L;
    L << w.b1 * (w.a1 * kappa - 1), w.b1 * w.a1 * kappa, w.b2 * w.a2 * kappa,
        w.b2 * (w.a2 * kappa - 1);
    const Eigen::Vector2d forcing(w.b1 * w.a1 * g, w.b2 * w.a2 * g);
    const Eigen::Vector2d equilibrium = -L.inverse() * forcing;
    Eigen::VectorXd x = Eigen::VectorXd::Zero(2);
    const Eigen::ArrayXd rate = Eigen::ArrayXd::Constant(1, sigma);
    auto f = [&](const Eigen::VectorXd& v, double, Eigen::VectorXd& d) {
      d = sigma * (L * v + forcing);
    };
    for (int j = 0; j < 400; ++j) st.step(f, x, j * h, h, rate, rate, rate, -1);
    CHECK(x(0) == doctest::Approx(equilibrium(0)).epsilon(1e-13));
    CHECK(x(1) == doctest::Approx(equilibrium(1)).epsilon(1e-13));
    if (kappa == 0.0) CHECK(x(1) == doctest::Approx(w.a2 * g).epsilon(1e-13));
    // One step from rest is the exact solution x(h) = (I − e^{σhL})x* (analytic), e^{σhL} from
    // the eigen-decomposition of L.
    x.setZero();
    st.step(f, x, 0.0, h, rate, rate, rate, -1);
    Eigen::EigenSolver<Eigen::Matrix2d> es(sigma * h * L);
    const Eigen::Matrix2d E =
        (es.eigenvectors() * es.eigenvalues().array().exp().matrix().asDiagonal() *
         es.eigenvectors().inverse())
            .real();
    const Eigen::Vector2d exact = (Eigen::Matrix2d::Identity() - E) * equilibrium;
    CHECK((x - exact).norm() <= 1e-13 * equilibrium.norm());
  }
}

TEST_CASE(
    "cosine strips on the hover demo at 400 steps: the exponential integrator matches RK4 at many "
    "steps") {
  // The beta planform's chord tends to zero at the tip, so cosine strips put a very fast lag state
  // there: RK4 needs about 1000 steps per cycle for the lifting line, the exponential scheme runs
  // at the default 400 and agrees with RK4 at 2000 steps to 1e-6 (a 4th-order error estimate).
  for (ModelKind kind : {ModelKind::wagner, ModelKind::lifting_line}) {
    ModelSpec s = samples::hover_insect();
    CAPTURE(static_cast<int>(kind));
    s.aero.kind = kind;
    s.strips.spacing = StripSpacing::cosine;
    s.simulation.tolerance = 1e-8;
    s.simulation.integrator = Integrator::exponential;
    const RunSummary fast = simulate(Model(s));
    CHECK(fast.status == RunStatus::converged);
    ModelSpec r = s;
    r.simulation.integrator = Integrator::rk4;
    CHECK_THROWS_AS(simulate(Model(r)), InputError);  // RK4 at 400 steps is refused
    r.simulation.steps_per_cycle = 1200;
    const RunSummary ref = simulate(Model(r));
    CHECK(ref.status == RunStatus::converged);
    CHECK(fast.mean_lift() == doctest::Approx(ref.mean_lift()).epsilon(1e-6));
  }
}
