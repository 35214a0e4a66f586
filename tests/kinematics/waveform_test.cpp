// Waveforms: analytic derivatives against central differences (an independent oracle), limits of
// the Berman & Wang (2007) families, the periodic spline.
#include <doctest/doctest.h>

#include <cmath>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/kinematics/waveform.hpp"

using namespace flapline;

namespace {
WaveformSpec make(WaveShape shape, double mean, double amp, double phase, double sharp = 0.5) {
  WaveformSpec s;
  s.shape = shape;
  s.mean = mean;
  s.amplitude = amp;
  s.phase = phase;
  s.sharpness = sharp;
  return s;
}

// Central differences of value and rate; step h relative to the period.
void check_derivatives(const Waveform& w, double f) {
  const double h = 1e-5 / f;
  for (int i = 0; i < 37; ++i) {
    const double t = (i + 0.123) / (37.0 * f);
    const WaveSample s = w.at(t, f), a = w.at(t - h, f), b = w.at(t + h, f);
    const double scale_rate = 1.0 + std::abs(s.rate), scale_acc = 1.0 + std::abs(s.accel);
    CHECK(std::abs((b.value - a.value) / (2 * h) - s.rate) < 1e-6 * scale_rate * f);
    CHECK(std::abs((b.rate - a.rate) / (2 * h) - s.accel) < 1e-6 * scale_acc * f);
  }
}
}  // namespace

TEST_CASE("every family's derivatives match central differences") {
  const double f = 7.0;
  check_derivatives(Waveform(make(WaveShape::harmonic, 0.1, 0.8, 0.3), "w"), f);
  check_derivatives(Waveform(make(WaveShape::smoothed_triangle, 0.0, 1.0, 0.2, 0.9), "w"), f);
  check_derivatives(Waveform(make(WaveShape::smoothed_square, 1.5, 0.7, -1.0, 3.0), "w"), f);
  WaveformSpec four = make(WaveShape::fourier, 0.2, 0, 0.1);
  four.harmonic_amplitudes = {1.0, 0.3, 0.05};
  four.harmonic_phases = {0.0, 1.0, -0.5};
  check_derivatives(Waveform(four, "w"), f);
  WaveformSpec table = make(WaveShape::table, 0, 0, 0.4);
  table.table_fraction = {0.0, 0.2, 0.45, 0.7, 1.0};
  table.table_value = {0.0, 1.0, 0.3, -0.8, 0.0};
  check_derivatives(Waveform(table, "w"), f);
}

TEST_CASE("harmonic waveform follows x = mean + amplitude sin(2πft + phase)") {
  // analytic, DESIGN §2: amplitude is half the peak-to-peak swing
  const Waveform w(make(WaveShape::harmonic, 0.5, 2.0, 0.25), "w");
  const double f = 3.0, t = 0.0417;
  CHECK(w.at(t, f).value == doctest::Approx(0.5 + 2.0 * std::sin(2 * kPi * f * t + 0.25)));
  CHECK(w.maximum() - w.minimum() == doctest::Approx(4.0).epsilon(1e-5));
}

TEST_CASE("Berman & Wang families: limits and peak values") {
  // Berman & Wang 2007 (J. Fluid Mech. 582): asin(K sin θ)/asin K -> sin θ as K -> 0 and reaches
  // ±1 at θ = ±90° for every K; tanh(C sin θ)/tanh C likewise (property of the formulas).
  const double f = 1.0;
  const Waveform tri_soft(make(WaveShape::smoothed_triangle, 0, 1, 0, 1e-6), "w");
  const Waveform tri(make(WaveShape::smoothed_triangle, 0, 1, 0, 0.9999), "w");
  const Waveform sq_soft(make(WaveShape::smoothed_square, 0, 1, 0, 1e-4), "w");
  const Waveform sq(make(WaveShape::smoothed_square, 0, 1, 0, 20.0), "w");
  for (double t : {0.03, 0.1, 0.2, 0.4, 0.66}) {
    CHECK(tri_soft.at(t, f).value == doctest::Approx(std::sin(2 * kPi * t)).epsilon(1e-9));
    CHECK(sq_soft.at(t, f).value == doctest::Approx(std::sin(2 * kPi * t)).epsilon(1e-7));
  }
  CHECK(tri.at(0.25, f).value == doctest::Approx(1.0).epsilon(1e-12));
  CHECK(sq.at(0.25, f).value == doctest::Approx(1.0).epsilon(1e-12));
  // Near-triangle: nearly linear between the peaks, slope -> 4 per cycle (analytic for K -> 1).
  CHECK(tri.at(0.1, f).value == doctest::Approx(0.4).epsilon(0.01));
  // Near-square: close to ±1 away from the switch.
  CHECK(sq.at(0.1, f).value > 0.99);
}

TEST_CASE("tabulated cycle: periodic spline through the rows, C² across the seam") {
  WaveformSpec s = make(WaveShape::table, 0, 0, 0);
  for (int i = 0; i <= 24; ++i) {
    s.table_fraction.push_back(i / 24.0);
    s.table_value.push_back(std::sin(2 * kPi * i / 24.0));
  }
  s.table_value.back() = s.table_value.front();
  const Waveform w(s, "w");
  for (int i = 0; i < 24; ++i)
    CHECK(w.at(i / 24.0, 1.0).value == doctest::Approx(s.table_value[i]));
  // A periodic cubic spline of a sampled sine converges as h⁴ (common practice): 24 points give
  // about 1e-5 in value.
  for (double t : {0.013, 0.31, 0.77})
    CHECK(std::abs(w.at(t, 1.0).value - std::sin(2 * kPi * t)) < 2e-5);
  const WaveSample before = w.at(1.0 - 1e-9, 1.0), after = w.at(1e-9, 1.0);
  CHECK(before.rate == doctest::Approx(after.rate).epsilon(1e-6));
  CHECK(before.accel == doctest::Approx(after.accel).epsilon(1e-5));
}

TEST_CASE("a table whose last value differs from its first is rejected") {
  WaveformSpec s = make(WaveShape::table, 0, 0, 0);
  s.table_fraction = {0.0, 0.3, 0.6, 1.0};
  s.table_value = {0.0, 1.0, 0.5, 0.2};
  CHECK_THROWS_WITH_AS(Waveform(s, "gait.pitch"), doctest::Contains("not periodic"), InputError);
  CHECK_THROWS_WITH_AS(Waveform(make(WaveShape::smoothed_triangle, 0, 1, 0, 1.0), "gait.stroke"),
                       doctest::Contains("gait.stroke.sharpness"), InputError);
}

TEST_CASE("extremes are exact over the whole cycle, not only at sample points") {
  // Oracle: brute-force sampling at 2^20 points per cycle (an independent, slow search); the
  // exact extremes can only lie outside the sampled ones by the sampling's own error.
  auto brute = [](const Waveform& w) {
    double lo = 1e300, hi = -1e300;
    for (int k = 0; k < (1 << 20); ++k) {
      const double v = w.at(k / double(1 << 20), 1.0).value;
      lo = std::min(lo, v);
      hi = std::max(hi, v);
    }
    return std::pair<double, double>(lo, hi);
  };
  WaveformSpec f;
  f.shape = WaveShape::fourier;
  f.mean = 0.2;
  f.harmonic_amplitudes = {1.0, 0.0, 0.3, 0.05, 0.0, 0.0, 0.02};
  f.harmonic_phases = {0.1, 0.0, 1.3, -0.4, 0.0, 0.0, 2.0};
  const Waveform wf(f, "gait.stroke");
  const auto [flo, fhi] = brute(wf);
  CHECK(wf.minimum() <= flo);
  CHECK(wf.maximum() >= fhi);
  CHECK(wf.minimum() == doctest::Approx(flo).epsilon(1e-9));
  CHECK(wf.maximum() == doctest::Approx(fhi).epsilon(1e-9));

  WaveformSpec t;
  t.shape = WaveShape::table;
  t.table_fraction = {0.0, 0.2, 0.45, 0.7, 1.0};
  t.table_value = {0.0, 1.0, -0.3, 0.8, 0.0};  // the spline overshoots between the knots
  const Waveform wt(t, "gait.pitch");
  const auto [tlo, thi] = brute(wt);
  CHECK(wt.maximum() > 1.0);
  CHECK(wt.minimum() == doctest::Approx(tlo).epsilon(1e-9));
  CHECK(wt.maximum() == doctest::Approx(thi).epsilon(1e-9));

  // analytic: a harmonic's extremes are mean ± |amplitude| whatever its phase, so a span ratio
  // touching 0 between any two samples is caught.
  WaveformSpec h;
  h.mean = 0.5;
  h.amplitude = -0.5;
  h.phase = 0.123;
  const Waveform wh(h, "gait.span_ratio");
  CHECK(wh.minimum() == 0.0);
  CHECK(wh.maximum() == 1.0);
}
