#include "flapline/aero/section_loads.hpp"

#include <cmath>

#include "flapline/case/model.hpp"
#include "flapline/case/stage_kinematics.hpp"
#include "flapline/case/workspace.hpp"
#include "flapline/common/math.hpp"

namespace flapline {
namespace {
struct StripContext {
  const SectionState& sec;
  const WingPose& pose;
  double chord, width;
};
StripContext context(const Model& model, const Workspace& ws, Eigen::Index k) {
  const Eigen::Index n = model.strips_per_wing();
  const std::size_t s = k < n ? 0 : 1;
  const WingPose& pose = ws.poses[s];
  return {ws.sections[static_cast<std::size_t>(k)], pose, model.pair().chord(k),
          pose.span_ratio * model.pair().width(k)};
}
}  // namespace

void circulation_loads(const Model& model, Workspace& ws) {
  const double rho = model.air().density;
  const double eta = model.aero_options().suction_recovery;
  const double kappa = model.aero_options().vortex_lift;
  const bool reverse_no_suction = model.aero_options().reverse_flow == ReverseFlow::no_suction;
  StripLoads& L = ws.loads;
  for (Eigen::Index k = 0; k < model.strip_count(); ++k) {
    const StripContext x = context(model, ws, k);
    const double c = x.chord;
    const double w_e = L.w_effective(k);
    const double gamma = kPi * c * w_e;                  // Γ = πc·w_E
    const double w_s = w_e - 0.25 * x.pose.omega_s * c;  // leading-edge normal-wash
    const double normal =
        rho * gamma * x.sec.tangential_speed + kappa * kPi * rho * c * w_s * std::abs(w_s);
    const bool keep = !(reverse_no_suction && x.sec.tangential_speed < 0.0);
    const double suction = keep ? eta * kPi * rho * c * w_s * w_s : 0.0;
    L.circulation(k) = gamma;
    L.w_suction(k) = w_s;
    L.force_quarter.col(k) = x.width * (normal * x.sec.normal_axis + suction * x.sec.chord_axis);
  }
  add_noncirculatory_loads(model, ws);
  if (model.aero_options().profile_drag.law != ProfileDragLaw::none) add_profile_drag(model, ws);
}

void revolving_fit_loads(const Model& model, Workspace& ws) {
  const double rho = model.air().density;
  const RevolvingFit& fit = model.aero_options().fit;
  StripLoads& L = ws.loads;
  for (Eigen::Index k = 0; k < model.strip_count(); ++k) {
    const StripContext x = context(model, ws, k);
    const double c = x.chord;
    const double ut = x.sec.tangential_speed, w = x.sec.w_pivot;  // pitch-axis velocity
    const double u = std::hypot(ut, w);
    const double alpha = std::atan2(w, ut);
    const double cl = fit.lift_coefficient(alpha), cd = fit.drag_coefficient(alpha);
    // Lift ⟂ and drag ∥ to the section velocity: U·l̂ = w e_c + U_t e_n, U·d̂ = −U_t e_c + w e_n.
    const double q = 0.5 * rho * c * u;
    const double f_c = q * (cl * w - cd * ut);
    double f_n = q * (cl * ut + cd * w);
    // Rotational force π(¾ − x₀)ρU c² ω_s normal to the chord (Sane & Dickinson 2002).
    f_n += kPi * rho * u * c * model.pair().three_quarter_arm(k) * x.pose.omega_s;
    L.circulation(k) = 0.5 * u * c * cl;  // Γ with ρUΓ = ½ρU²c C_L (reported only)
    L.w_effective(k) = L.circulation(k) / (kPi * c);
    L.w_suction(k) = 0.0;
    L.force_quarter.col(k) = x.width * (f_n * x.sec.normal_axis + f_c * x.sec.chord_axis);
  }
  add_noncirculatory_loads(model, ws);
}

void add_noncirculatory_loads(const Model& model, Workspace& ws) {
  const double rho = model.air().density;
  StripLoads& L = ws.loads;
  for (Eigen::Index k = 0; k < model.strip_count(); ++k) {
    const StripContext x = context(model, ws, k);
    const double c = x.chord, b = 0.5 * c;
    const double added_mass = 0.25 * kPi * rho * c * c;  // m_a per unit span
    L.force_mid.col(k) = x.width * added_mass * x.sec.w_half_rate * x.sec.normal_axis;
    const double couple = -0.5 * kPi * rho * x.sec.tangential_speed * b * b * b * x.pose.omega_s -
                          0.125 * kPi * rho * b * b * b * b * x.pose.omega_s_dot;
    L.couple.col(k) = x.width * couple * x.pose.span_axis;
  }
}

void add_profile_drag(const Model& model, Workspace& ws) {
  const double rho = model.air().density, nu = model.air().kinematic_viscosity;
  const ProfileDrag& law = model.aero_options().profile_drag;
  StripLoads& L = ws.loads;
  for (Eigen::Index k = 0; k < model.strip_count(); ++k) {
    const StripContext x = context(model, ws, k);
    // The air's velocity relative to mid-chord, in the section plane: −U_t e_c + w_½ e_n.
    const double ut = x.sec.tangential_speed, w = x.sec.w_half;
    const double u = std::hypot(ut, w);
    const double cd0 = law.coefficient_at(u * x.chord / nu);
    const double q = 0.5 * rho * cd0 * x.chord * u * x.width;
    L.profile_drag.col(k) = q * (w * x.sec.normal_axis - ut * x.sec.chord_axis);
    L.force_mid.col(k) += L.profile_drag.col(k);
  }
}

}  // namespace flapline
