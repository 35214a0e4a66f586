#include "flapline/simulation/wrench.hpp"

#include <array>

#include "flapline/case/model.hpp"
#include "flapline/case/workspace.hpp"
#include "flapline/common/math.hpp"
#include "flapline/simulation/drive.hpp"

namespace flapline {

LoadSample sum_loads(const Model& model, const Workspace& ws, double t) {
  LoadSample out;
  out.time = t;
  const Eigen::Index n = model.strips_per_wing();
  const StripLoads& L = ws.loads;
  std::array<Wrench, 2> virtual_wrench;  // each wing in its virtual frame (for the drive)
  std::array<double, 2> span_load{0.0, 0.0};
  for (int s = 0; s < 2; ++s) {
    const WingPose& pose = ws.poses[static_cast<std::size_t>(s)];
    Wrench& w = virtual_wrench[static_cast<std::size_t>(s)];
    double p_air = 0.0, p_act = 0.0, span = 0.0;
    for (Eigen::Index i = 0; i < n; ++i) {
      const Eigen::Index k = s * n + i;
      const SectionState& sec = ws.sections[static_cast<std::size_t>(k)];
      const Eigen::Vector3d fq = L.force_quarter.col(k), fm = L.force_mid.col(k),
                            c = L.couple.col(k);
      w.force += fq + fm;
      w.moment += sec.quarter.cross(fq) + sec.mid.cross(fm) + c;
      // −F·(v − wind) = F·q (q: air velocity relative to the point).
      p_air += fq.dot(sec.q_quarter) + fm.dot(sec.q_mid) - c.dot(pose.omega);
      p_act -= fq.dot(sec.v_rel_quarter) + fm.dot(sec.v_rel_mid) + c.dot(pose.omega_rel);
      span += model.pair().radius(k) * (fq + fm).dot(pose.span_axis);
    }
    span_load[static_cast<std::size_t>(s)] = span;
    Wrench& body = out.wing[static_cast<std::size_t>(s)];
    if (s == 0) {
      body = w;
    } else {
      body.force = mirror(w.force);
      body.moment = mirror_axial(w.moment);
    }
    out.total += body;
    out.wing_power_air[static_cast<std::size_t>(s)] = p_air;
    out.power_air += p_air;
    out.power_actuator += p_act;
  }
  const double rho = model.air().density;
  for (Eigen::Index k = 0; k < 2 * n; ++k)
    out.induced_drag -= rho * L.circulation(k) * L.w_induced(k) *
                        ws.poses[k < n ? 0 : 1].span_ratio * model.pair().width(k);
  if (model.aero_options().profile_drag.law != ProfileDragLaw::none)
    for (Eigen::Index k = 0; k < 2 * n; ++k)
      out.profile_drag +=
          k < n ? Eigen::Vector3d(L.profile_drag.col(k)) : mirror(L.profile_drag.col(k));
  add_drive(model, ws, virtual_wrench, span_load, out);
  return out;
}

}  // namespace flapline
