#include "flapline/case/aero_options.hpp"

#include <algorithm>
#include <cmath>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"

namespace flapline {
namespace {
// Fold α (rad) into [0°, 90°] using C(−α) = ±C(α) and C(180° − α) = ∓C(α); returns the folded
// angle in degrees and the sign the lift takes.
double fold(double alpha, double& lift_sign) {
  double a = std::remainder(alpha, 2.0 * kPi) / kDegree;  // (−180, 180]
  lift_sign = 1.0;
  if (a < 0.0) {
    a = -a;
    lift_sign = -lift_sign;
  }
  if (a > 90.0) {
    a = 180.0 - a;
    lift_sign = -lift_sign;
  }
  return a;
}
}  // namespace

double RevolvingFit::lift_coefficient(double alpha) const {
  double sign = 1.0;
  const double a = fold(alpha, sign);
  return sign * (lift_offset + lift_amplitude * std::sin((lift_rate * a - lift_shift) * kDegree));
}

double RevolvingFit::drag_coefficient(double alpha) const {
  double sign = 1.0;
  const double a = fold(alpha, sign);
  return drag_offset - drag_amplitude * std::cos((drag_rate * a - drag_shift) * kDegree);
}

WagnerCoefficients wagner_coefficients(WagnerFit fit) {
  switch (fit) {
    case WagnerFit::rt_jones:
      return {0.165, 0.335, 0.0455, 0.3};
    case WagnerFit::wp_jones:
      return {0.165, 0.335, 0.041, 0.32};
  }
  return {0.165, 0.335, 0.0455, 0.3};
}

double ProfileDrag::coefficient_at(double reynolds) const {
  switch (law) {
    case ProfileDragLaw::none:
      return 0.0;
    case ProfileDragLaw::constant:
      return coefficient;
    case ProfileDragLaw::blasius:
      // Laminar flat plate, skin friction 1.328/√Re on each face (Blasius 1908).
      return 2.0 * 1.328 / std::sqrt(std::max(reynolds, kMinReynolds));
  }
  return 0.0;
}

namespace {
/// No setting is silently ignored: a model option that the chosen model does not use, set to
/// anything but its default, is refused with what to do (DESIGN §7).
void refuse_unused(const AeroOptions& o) {
  const AeroOptions d;
  const std::string kind(to_string(o.kind));
  auto unused = [&](const char* key, const std::string& value, const std::string& used_by,
                    const std::string& hint) {
    throw InputError(key, value, "applies to " + used_by + " only, not to model.kind " + kind, hint)
        .between_keys();
  };
  if (o.law == CoefficientLaw::revolving_fit && o.kind != ModelKind::quasi_steady)
    unused("model.coefficient_law", "revolving_fit", "model.kind quasi_steady",
           "the lag models use the thin-airfoil law: remove the key, set it to thin_airfoil, or "
           "choose model.kind quasi_steady");
  const RevolvingFit& f = o.fit;
  const RevolvingFit& df = d.fit;
  const bool fit_changed = f.lift_offset != df.lift_offset ||
                           f.lift_amplitude != df.lift_amplitude || f.lift_rate != df.lift_rate ||
                           f.lift_shift != df.lift_shift || f.drag_offset != df.drag_offset ||
                           f.drag_amplitude != df.drag_amplitude || f.drag_rate != df.drag_rate ||
                           f.drag_shift != df.drag_shift;
  if (fit_changed && o.law != CoefficientLaw::revolving_fit)
    throw InputError("model.fit", "(coefficients)",
                     "is used by model.coefficient_law revolving_fit only (this run: " +
                         std::string(to_string(o.law)) + ")",
                     "remove model.fit or set model.coefficient_law: revolving_fit")
        .between_keys();
  if (o.wagner_fit != d.wagner_fit && o.kind == ModelKind::quasi_steady)
    unused("model.wagner_fit", std::string(to_string(o.wagner_fit)),
           "the lag models (wagner, lifting_line)",
           "the quasi-steady model has no lag: remove the key or choose a lag model");
  if (o.span_coupling != d.span_coupling && o.kind != ModelKind::lifting_line)
    unused("model.span_coupling", std::string(to_string(o.span_coupling)),
           "model.kind lifting_line", "remove the key or choose model.kind lifting_line");
  if (o.line_solve != d.line_solve && o.kind != ModelKind::lifting_line)
    unused("model.line_solve", std::string(to_string(o.line_solve)), "model.kind lifting_line",
           "remove the key or choose model.kind lifting_line");
  if (o.reverse_flow != d.reverse_flow && o.law == CoefficientLaw::revolving_fit)
    throw InputError("model.reverse_flow", std::string(to_string(o.reverse_flow)),
                     "applies to the thin_airfoil law only",
                     "the revolving fit extends itself to reverse flow by flat-plate symmetry")
        .between_keys();
  if (o.reverse_flow == ReverseFlow::no_suction && o.suction_recovery == 0.0)
    throw InputError("model.reverse_flow", "no_suction",
                     "drops a suction that model.suction_recovery: 0 has already removed",
                     "remove the key, or recover some suction (model.suction_recovery > 0)")
        .between_keys();
  if (o.inflow_relaxation != d.inflow_relaxation && o.inflow == InflowModel::none)
    throw InputError("model.inflow_relaxation", format_number(o.inflow_relaxation),
                     "is used with model.inflow only (this run: none)",
                     "remove the key or choose model.inflow: stroke_disc or span_disc")
        .between_keys();
}
}  // namespace

void validate(const AeroOptions& o) {
  if (!(o.suction_recovery >= 0.0 && o.suction_recovery <= 1.0))
    throw InputError("model.suction_recovery", format_number(o.suction_recovery),
                     "must lie in [0, 1]");
  if (!(o.vortex_lift >= 0.0 && o.vortex_lift <= 2.0))
    throw InputError("model.vortex_lift", format_number(o.vortex_lift), "must lie in [0, 2]");
  if (o.vortex_lift > 0.0 && o.suction_recovery > 0.0)
    throw InputError("model.vortex_lift", format_number(o.vortex_lift),
                     "must be 0 unless model.suction_recovery is 0",
                     "vortex lift replaces the leading-edge suction of a separated leading edge")
        .between_keys();
  const double c[] = {o.fit.lift_offset, o.fit.lift_amplitude, o.fit.lift_rate, o.fit.lift_shift,
                      o.fit.drag_offset, o.fit.drag_amplitude, o.fit.drag_rate, o.fit.drag_shift};
  for (double v : c)
    if (!std::isfinite(v))
      throw InputError("model.fit", format_number(v), "every coefficient must be finite");
  if ((o.vortex_lift > 0.0 || o.suction_recovery != 1.0) && o.law == CoefficientLaw::revolving_fit)
    throw InputError("model.suction_recovery", format_number(o.suction_recovery),
                     "applies to the thin_airfoil law only; leave it at 1 with revolving_fit",
                     "the fit already holds what the experiment measured")
        .between_keys();
  if (!(o.inflow_relaxation > 0.0 && o.inflow_relaxation <= 1.0))
    throw InputError("model.inflow_relaxation", format_number(o.inflow_relaxation),
                     "must lie in (0, 1]");
  if (o.inflow == InflowModel::span_disc && o.kind == ModelKind::lifting_line)
    throw InputError("model.inflow", "span_disc",
                     "does not apply to the lifting_line model, whose trailing vortices already "
                     "carry the downwash of the span",
                     "use stroke_disc (far wake of earlier strokes) or a strip model")
        .between_keys();
  const ProfileDrag& d = o.profile_drag;
  if (!(d.coefficient >= 0.0 && d.coefficient <= 2.0))
    throw InputError("model.profile_drag.coefficient", format_number(d.coefficient),
                     "must lie in [0, 2]");
  if (d.coefficient > 0.0 && d.law != ProfileDragLaw::constant)
    throw InputError("model.profile_drag.coefficient", format_number(d.coefficient),
                     "is used by the constant law only; set model.profile_drag.law: constant")
        .between_keys();
  if (d.law != ProfileDragLaw::none && o.law == CoefficientLaw::revolving_fit)
    throw InputError("model.profile_drag.law", std::string(to_string(d.law)),
                     "must be none with coefficient_law revolving_fit",
                     "the fit's drag coefficient already contains skin friction")
        .between_keys();
  refuse_unused(o);
}

}  // namespace flapline
