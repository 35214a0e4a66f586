#include "flapline/simulation/workspace.hpp"

#include "flapline/simulation/model.hpp"

namespace flapline {

void StripLoads::resize(Eigen::Index n) {
  force_quarter.setZero(3, n);
  force_mid.setZero(3, n);
  couple.setZero(3, n);
  circulation.setZero(n);
  w_effective.setZero(n);
  w_suction.setZero(n);
}

Workspace::Workspace(const Model& model) {
  const Eigen::Index n = model.strip_count();
  tangential.setZero(n);
  w_pivot.setZero(n);
  w_three_quarter.setZero(n);
  w_half.setZero(n);
  speed.setZero(n);
  sections.resize(static_cast<std::size_t>(n));
  loads.resize(n);
  state.setZero(model.aero().state_size(model));
  aero_scratch = model.aero().make_scratch(model);
}

void update_speeds(const Model& model, Workspace& ws, double t) {
  const Eigen::Index n = model.strips_per_wing();
  const PairArrays& pair = model.pair();
  for (int s = 0; s < 2; ++s) {
    const WingPose& pose = ws.poses[static_cast<std::size_t>(s)] =
        wing_pose(model.motion(static_cast<Side>(s)), t);
    const Eigen::Index o = s * n;
    strip_speeds(pose, model.strips(), ws.tangential.segment(o, n), ws.w_pivot.segment(o, n));
    ws.w_three_quarter.segment(o, n) =
        ws.w_pivot.segment(o, n) + pose.omega_s * pair.three_quarter_arm.segment(o, n);
    ws.w_half.segment(o, n) = ws.w_pivot.segment(o, n) + pose.omega_s * pair.half_arm.segment(o, n);
  }
  ws.speed = (ws.tangential.square() + ws.w_half.square()).sqrt();
}

void update_sections(const Model& model, Workspace& ws, double t) {
  update_speeds(model, ws, t);
  const Eigen::Index n = model.strips_per_wing();
  const Strips& st = model.strips();
  for (Eigen::Index k = 0; k < 2 * n; ++k) {
    const int s = k < n ? 0 : 1;
    const Eigen::Index i = k - s * n;
    ws.sections[static_cast<std::size_t>(k)] =
        section_state(ws.poses[static_cast<std::size_t>(s)], model.motion(static_cast<Side>(s)),
                      st.radius(i), st.chord(i), st.leading_edge(i), st.cos_twist(i),
                      st.sin_twist(i));
  }
}

}  // namespace flapline
