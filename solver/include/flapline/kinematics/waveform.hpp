#pragma once
/// \file
/// Periodic waveforms of the gait angles and span ratio, with analytic first and second time
/// derivatives (kinematics must be C², since the added mass needs the second derivative).
/// Formulas and parameter meanings: configs/README.md, section "Waveforms".

#include <string>
#include <vector>

#include "flapline/common/enum_names.hpp"

namespace flapline {

/// Waveform families (θ = 2π f t + phase throughout).
enum class WaveShape {
  harmonic,           ///< x = mean + amplitude sin θ
  fourier,            ///< x = mean + Σₙ aₙ sin(nθ₁ + φₙ), θ₁ = 2π f t
  smoothed_triangle,  ///< x = mean + amplitude asin(K sin θ)/asin K, 0 < K < 1 (Berman & Wang 2007)
  smoothed_square,    ///< x = mean + amplitude tanh(C sin θ)/tanh C, C > 0 (Berman & Wang 2007)
  table,              ///< periodic cubic spline through (cycle fraction, value) rows
  step                ///< x = mean before `delay`, mean + amplitude after (not periodic; for
                      ///< indicial checks of fixed wings: the impulse at the jump is not modelled)
};
template <>
struct EnumNames<WaveShape> {
  static constexpr std::array<std::pair<WaveShape, std::string_view>, 6> items{
      {{WaveShape::harmonic, "harmonic"},
       {WaveShape::fourier, "fourier"},
       {WaveShape::smoothed_triangle, "smoothed_triangle"},
       {WaveShape::smoothed_square, "smoothed_square"},
       {WaveShape::table, "table"},
       {WaveShape::step, "step"}}};
};

/// Parameters of one waveform, in SI (angles in rad; the YAML layer converts from degrees).
struct WaveformSpec {
  WaveShape shape = WaveShape::harmonic;
  double mean = 0.0;       ///< value units
  double amplitude = 0.0;  ///< half the peak-to-peak swing, value units
  double phase = 0.0;      ///< rad, added to 2π f t
  double sharpness = 0.5;  ///< K in (0, 1) for smoothed_triangle, C in (0, 50] for smoothed_square
  double delay = 0.0;      ///< s, time of the jump (step), >= 0
  std::vector<double> harmonic_amplitudes;  ///< fourier: aₙ for n = 1, 2, ...
  std::vector<double> harmonic_phases;      ///< fourier: φₙ (rad)
  std::vector<double> table_fraction;       ///< table: cycle fraction, 0 first, 1 last, increasing
  std::vector<double> table_value;          ///< table: values; first and last equal (periodic)
};

/// True when two specs describe the same waveform field by field.
bool same_waveform(const WaveformSpec& a, const WaveformSpec& b);

/// Value and time derivatives of a waveform at one instant.
struct WaveSample {
  double value = 0.0;  ///< x
  double rate = 0.0;   ///< dx/dt (per s)
  double accel = 0.0;  ///< d²x/dt² (per s²)
};

/// A validated waveform. Evaluation allocates nothing and is thread-safe.
class Waveform {
 public:
  /// The constant zero.
  Waveform() = default;
  /// Validate and build; `key` is the key path used in errors (e.g. `gait.pitch`). `scale`
  /// converts the spec's value units to report units in messages (1/kDegree for angles).
  Waveform(WaveformSpec spec, const std::string& key, double scale = 1.0);

  /// Value and derivatives at time t (s) for flapping frequency f (Hz).
  WaveSample at(double t, double frequency) const;
  /// Smallest and largest value over a cycle, exact: mean ± |amplitude| for the harmonic and
  /// both smoothed families, the knots and the derivative's roots of every spline segment for a
  /// table, and for a Fourier series the sign changes of the derivative on 16 points per period
  /// of the highest harmonic refined by bisection.
  double minimum() const noexcept { return min_; }
  double maximum() const noexcept { return max_; }
  const WaveformSpec& spec() const noexcept { return spec_; }

 private:
  WaveSample unit_cycle(double u) const;  // derivatives with respect to the cycle fraction u
  void table_extremes();
  void fourier_extremes();
  WaveformSpec spec_;
  std::vector<double> spline_second_;  // periodic spline second derivatives (table)
  double min_ = 0.0, max_ = 0.0;
};

}  // namespace flapline
