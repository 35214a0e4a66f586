#include "flapline/kinematics/waveform.hpp"

#include <array>

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"

namespace flapline {

bool same_waveform(const WaveformSpec& a, const WaveformSpec& b) {
  return a.shape == b.shape && a.mean == b.mean && a.amplitude == b.amplitude &&
         a.phase == b.phase && a.sharpness == b.sharpness && a.delay == b.delay &&
         a.harmonic_amplitudes == b.harmonic_amplitudes && a.harmonic_phases == b.harmonic_phases &&
         a.table_fraction == b.table_fraction && a.table_value == b.table_value;
}

namespace {
constexpr double kTwoPi = 2.0 * kPi;

void require_finite(double v, const std::string& key, double scale) {
  if (!std::isfinite(v)) throw InputError(key, format_number(v * scale), "must be a finite number");
}
}  // namespace

Waveform::Waveform(WaveformSpec spec, const std::string& key, double scale)
    : spec_(std::move(spec)) {
  auto& s = spec_;
  require_finite(s.mean, key + ".mean", scale);
  require_finite(s.amplitude, key + ".amplitude", scale);
  require_finite(s.phase, key + ".phase", 1.0 / kDegree);
  switch (s.shape) {
    case WaveShape::harmonic:
      break;
    case WaveShape::step:
      if (!(s.delay >= 0.0) || !std::isfinite(s.delay))
        throw InputError(key + ".delay", format_number(s.delay), "must be >= 0 (s)");
      break;
    case WaveShape::smoothed_triangle:
      if (!(s.sharpness > 0.0 && s.sharpness < 1.0))
        throw InputError(key + ".sharpness", format_number(s.sharpness),
                         "must lie in (0, 1) for smoothed_triangle",
                         "1 is the exact triangle, which is not smooth enough for added mass");
      break;
    case WaveShape::smoothed_square:
      if (!(s.sharpness > 0.0 && s.sharpness <= 50.0))
        throw InputError(key + ".sharpness", format_number(s.sharpness),
                         "must lie in (0, 50] for smoothed_square");
      break;
    case WaveShape::fourier:
      if (s.harmonic_amplitudes.empty() || s.harmonic_amplitudes.size() > 50 ||
          s.harmonic_phases.size() != s.harmonic_amplitudes.size())
        throw InputError(key + ".harmonics", std::to_string(s.harmonic_amplitudes.size()),
                         "needs 1 to 50 entries, each with amplitude and phase");
      for (std::size_t n = 0; n < s.harmonic_amplitudes.size(); ++n) {
        require_finite(s.harmonic_amplitudes[n], key + ".harmonics", scale);
        require_finite(s.harmonic_phases[n], key + ".harmonics", 1.0 / kDegree);
      }
      break;
    case WaveShape::table: {
      const auto& u = s.table_fraction;
      const auto& y = s.table_value;
      if (u.size() < 4 || u.size() > 2000 || y.size() != u.size())
        throw InputError(key + ".points", std::to_string(u.size()) + " rows",
                         "needs 4 to 2000 rows of [cycle_fraction, value]");
      if (u.front() != 0.0 || u.back() != 1.0)
        throw InputError(
            key + ".points",
            "cycle fractions " + format_number(u.front()) + ".." + format_number(u.back()),
            "the first row must be at cycle fraction 0 and the last at 1");
      for (std::size_t i = 0; i < u.size(); ++i) {
        require_finite(y[i], key + ".points", scale);
        if (i > 0 && !(u[i] > u[i - 1]))
          throw InputError(key + ".points", "row " + std::to_string(i + 1),
                           "cycle fractions must increase strictly");
      }
      const double span =
          *std::max_element(y.begin(), y.end()) - *std::min_element(y.begin(), y.end());
      if (std::abs(y.back() - y.front()) > 1e-9 * std::max(1.0, span))
        throw InputError(key + ".points",
                         "first " + format_number(y.front() * scale) + ", last " +
                             format_number(y.back() * scale),
                         "table not periodic: the value at fraction 1 must equal the one at 0");
      // Periodic cubic spline: h_{j-1}M_{j-1} + 2(h_{j-1}+h_j)M_j + h_j M_{j+1} = 6(d_j - d_{j-1}).
      const int n = static_cast<int>(u.size()) - 1;
      Eigen::MatrixXd a = Eigen::MatrixXd::Zero(n, n);
      Eigen::VectorXd rhs(n);
      for (int j = 0; j < n; ++j) {
        const int jm = (j + n - 1) % n, jp = (j + 1) % n;
        const double hm = u[static_cast<std::size_t>(j == 0 ? n : j)] -
                          u[static_cast<std::size_t>(j == 0 ? n - 1 : j - 1)];
        const double h = u[static_cast<std::size_t>(j + 1)] - u[static_cast<std::size_t>(j)];
        const double dm = (y[static_cast<std::size_t>(j)] - y[static_cast<std::size_t>(jm)]) / hm;
        const double d = (y[static_cast<std::size_t>(j + 1)] - y[static_cast<std::size_t>(j)]) / h;
        a(j, jm) += hm;
        a(j, j) += 2.0 * (hm + h);
        a(j, jp) += h;
        rhs(j) = 6.0 * (d - dm);
      }
      Eigen::VectorXd m = a.partialPivLu().solve(rhs);
      spline_second_.assign(m.data(), m.data() + n);
      spline_second_.push_back(spline_second_.front());
      break;
    }
  }
  if (s.shape == WaveShape::step) {
    min_ = std::min(s.mean, s.mean + s.amplitude);
    max_ = std::max(s.mean, s.mean + s.amplitude);
    return;
  }
  // Exact extremes over the whole cycle (range checks must hold between samples too).
  switch (s.shape) {
    case WaveShape::harmonic:
    case WaveShape::smoothed_triangle:  // asin(K sinθ)/asin K reaches ±1 exactly at sinθ = ±1
    case WaveShape::smoothed_square:    // tanh(C sinθ)/tanh C likewise
      min_ = s.mean - std::abs(s.amplitude);
      max_ = s.mean + std::abs(s.amplitude);
      return;
    case WaveShape::table:
      table_extremes();
      return;
    case WaveShape::fourier:
      fourier_extremes();
      return;
    case WaveShape::step:
      return;
  }
}

void Waveform::table_extremes() {
  // Each periodic-spline segment is a cubic in B = (v − x_j)/h: its extremes lie at the knots
  // or where its derivative (a quadratic in B) vanishes inside the segment.
  const auto& x = spec_.table_fraction;
  const auto& y = spec_.table_value;
  min_ = max_ = y.front();
  for (std::size_t j = 0; j + 1 < x.size(); ++j) {
    const double h = x[j + 1] - x[j], m0 = spline_second_[j], m1 = spline_second_[j + 1];
    auto value = [&](double b) {
      const double a = 1.0 - b;
      return a * y[j] + b * y[j + 1] + ((a * a * a - a) * m0 + (b * b * b - b) * m1) * h * h / 6;
    };
    min_ = std::min(min_, y[j + 1]);
    max_ = std::max(max_, y[j + 1]);
    // d/dv = 0:  h(m1 − m0)/2·B² + h·m0·B + (y1 − y0)/h − h(2m0 + m1)/6 = 0
    const double qa = 0.5 * h * (m1 - m0), qb = h * m0,
                 qc = (y[j + 1] - y[j]) / h - h * (2 * m0 + m1) / 6;
    std::array<double, 2> roots{-1.0, -1.0};
    if (std::abs(qa) < 1e-300) {
      if (std::abs(qb) > 1e-300) roots[0] = -qc / qb;
    } else {
      const double disc = qb * qb - 4 * qa * qc;
      if (disc >= 0) {
        const double q = -0.5 * (qb + std::copysign(std::sqrt(disc), qb));
        roots[0] = q / qa;
        if (q != 0.0) roots[1] = qc / q;
      }
    }
    for (double b : roots)
      if (b > 0.0 && b < 1.0) {
        min_ = std::min(min_, value(b));
        max_ = std::max(max_, value(b));
      }
  }
}

void Waveform::fourier_extremes() {
  // Dense sampling (16 points per period of the highest harmonic, at least 64), then each
  // sign change of the derivative refined by bisection to the extreme between the samples.
  const int points = std::max<int>(64, 16 * static_cast<int>(spec_.harmonic_amplitudes.size()));
  min_ = max_ = unit_cycle(0.0).value;
  WaveSample prev = unit_cycle(0.0);
  for (int k = 1; k <= points; ++k) {
    const double u0 = static_cast<double>(k - 1) / points, u1 = static_cast<double>(k) / points;
    const WaveSample cur = unit_cycle(u1);
    min_ = std::min(min_, cur.value);
    max_ = std::max(max_, cur.value);
    if ((prev.rate > 0.0) != (cur.rate > 0.0)) {
      double lo = u0, hi = u1;
      const bool rising = prev.rate > 0.0;
      for (int it = 0; it < 60; ++it) {
        const double mid = 0.5 * (lo + hi);
        ((unit_cycle(mid).rate > 0.0) == rising ? lo : hi) = mid;
      }
      const double v = unit_cycle(0.5 * (lo + hi)).value;
      min_ = std::min(min_, v);
      max_ = std::max(max_, v);
    }
    prev = cur;
  }
}

WaveSample Waveform::unit_cycle(double u) const {
  const auto& s = spec_;
  WaveSample out;
  switch (s.shape) {
    case WaveShape::harmonic: {
      const double th = kTwoPi * u + s.phase;
      out.value = s.mean + s.amplitude * std::sin(th);
      out.rate = s.amplitude * kTwoPi * std::cos(th);
      out.accel = -s.amplitude * kTwoPi * kTwoPi * std::sin(th);
      return out;
    }
    case WaveShape::fourier: {
      out.value = s.mean;
      const double th1 = kTwoPi * u + s.phase;
      for (std::size_t k = 0; k < s.harmonic_amplitudes.size(); ++k) {
        const double n = static_cast<double>(k + 1);
        const double th = n * th1 + s.harmonic_phases[k];
        const double a = s.harmonic_amplitudes[k];
        out.value += a * std::sin(th);
        out.rate += a * n * kTwoPi * std::cos(th);
        out.accel -= a * n * n * kTwoPi * kTwoPi * std::sin(th);
      }
      return out;
    }
    case WaveShape::smoothed_triangle: {
      // g = asin(K sinθ); g' = Kθ' cosθ / sqrt(1-K²sin²θ); g'' = Kθ'² sinθ (K²-1)/(1-K²sin²θ)^{3/2}
      const double K = s.sharpness, th = kTwoPi * u + s.phase, w = kTwoPi;
      const double sn = std::sin(th), cs = std::cos(th), d = 1.0 - K * K * sn * sn;
      const double norm = s.amplitude / std::asin(K);
      out.value = s.mean + norm * std::asin(K * sn);
      out.rate = norm * K * w * cs / std::sqrt(d);
      out.accel = norm * K * w * w * sn * (K * K - 1.0) / (d * std::sqrt(d));
      return out;
    }
    case WaveShape::smoothed_square: {
      // g = tanh(C sinθ); g' = Cθ' cosθ sech²; g'' = Cθ'² sech² (-sinθ - 2C cos²θ tanh)
      const double C = s.sharpness, th = kTwoPi * u + s.phase, w = kTwoPi;
      const double sn = std::sin(th), cs = std::cos(th), tg = std::tanh(C * sn);
      const double sech2 = 1.0 - tg * tg;
      const double norm = s.amplitude / std::tanh(C);
      out.value = s.mean + norm * tg;
      out.rate = norm * C * w * cs * sech2;
      out.accel = norm * C * w * w * sech2 * (-sn - 2.0 * C * cs * cs * tg);
      return out;
    }
    case WaveShape::step:  // handled in at(): it needs the absolute time
      out.value = s.mean;
      return out;
    case WaveShape::table: {
      const auto& x = s.table_fraction;
      const auto& y = s.table_value;
      double v = u + s.phase / kTwoPi;
      v -= std::floor(v);
      const auto it = std::upper_bound(x.begin(), x.end(), v);
      std::size_t j = static_cast<std::size_t>(std::max<std::ptrdiff_t>(it - x.begin(), 1)) - 1;
      j = std::min(j, x.size() - 2);
      const double h = x[j + 1] - x[j];
      const double A = (x[j + 1] - v) / h, B = (v - x[j]) / h;
      const double m0 = spline_second_[j], m1 = spline_second_[j + 1];
      out.value =
          A * y[j] + B * y[j + 1] + ((A * A * A - A) * m0 + (B * B * B - B) * m1) * h * h / 6;
      out.rate =
          (y[j + 1] - y[j]) / h - (3 * A * A - 1) / 6 * h * m0 + (3 * B * B - 1) / 6 * h * m1;
      out.accel = A * m0 + B * m1;
      return out;
    }
  }
  return out;
}

WaveSample Waveform::at(double t, double frequency) const {
  if (spec_.shape == WaveShape::step) {
    WaveSample s;
    s.value = spec_.mean + (t >= spec_.delay ? spec_.amplitude : 0.0);
    return s;
  }
  double u = frequency * t;
  u -= std::floor(u);
  WaveSample s = unit_cycle(u);
  s.rate *= frequency;
  s.accel *= frequency * frequency;
  return s;
}

}  // namespace flapline
