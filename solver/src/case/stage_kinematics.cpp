#include "flapline/case/stage_kinematics.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>

namespace flapline {

Eigen::Index cycle_slot(double t, double frequency, Eigen::Index slots) {
  if (slots == 0) return -1;
  const double u = t * frequency * static_cast<double>(slots);
  const double nearest = std::round(u);
  if (std::abs(u - nearest) >= 1e-6) return -1;
  Eigen::Index j = static_cast<Eigen::Index>(nearest) % slots;
  return j < 0 ? j + slots : j;
}

StageSpeeds stage_speeds(const Model& model, Workspace& ws, double t) {
  assert(ws.built_for(model) && "a Workspace serves the Model it was built or reset for");
  const Eigen::Index j =
      cycle_slot(t, model.frequency(), static_cast<Eigen::Index>(ws.stage_filled.size()));
  if (j >= 0) {
    if (!ws.stage_filled[static_cast<std::size_t>(j)]) {
      update_speeds(model, ws, t);
      ws.stage_rate.col(j) = ws.rate;
      ws.stage_w34.col(j) = ws.w_three_quarter;
      ws.stage_filled[static_cast<std::size_t>(j)] = 1;
    }
    return {ws.stage_rate.col(j), ws.stage_w34.col(j)};
  }
  update_speeds(model, ws, t);
  return {ws.rate, ws.w_three_quarter};
}

void update_speeds(const Model& model, Workspace& ws, double t) {
  assert(ws.built_for(model) && "a Workspace serves the Model it was built or reset for");
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
  ws.rate = ws.speed * pair.inverse_semichord;
}

void update_sections(const Model& model, Workspace& ws, double t) {
  assert(ws.built_for(model) && "a Workspace serves the Model it was built or reset for");
  const Eigen::Index j =
      cycle_slot(t, model.frequency(), static_cast<Eigen::Index>(ws.sample_filled.size()));
  const Eigen::Index n2 = model.strip_count();
  const auto arrays = [&] {
    return std::array<Eigen::ArrayXd*, 6>{&ws.tangential, &ws.w_pivot, &ws.w_three_quarter,
                                          &ws.w_half,     &ws.speed,   &ws.rate};
  };
  const std::size_t first = static_cast<std::size_t>(j) * static_cast<std::size_t>(n2);
  if (j >= 0 && ws.sample_filled[static_cast<std::size_t>(j)]) {
    ws.poses = ws.sample_poses[static_cast<std::size_t>(j)];
    std::copy_n(ws.sample_sections.begin() + static_cast<std::ptrdiff_t>(first), n2,
                ws.sections.begin());
    const auto a = arrays();
    for (std::size_t q = 0; q < a.size(); ++q)
      *a[q] = ws.sample_arrays.col(6 * j + static_cast<Eigen::Index>(q));
    return;
  }
  compute_sections(model, ws, t);
  if (j >= 0) {
    ws.sample_poses[static_cast<std::size_t>(j)] = ws.poses;
    std::copy_n(ws.sections.begin(), n2,
                ws.sample_sections.begin() + static_cast<std::ptrdiff_t>(first));
    const auto a = arrays();
    for (std::size_t q = 0; q < a.size(); ++q)
      ws.sample_arrays.col(6 * j + static_cast<Eigen::Index>(q)) = *a[q];
    ws.sample_filled[static_cast<std::size_t>(j)] = 1;
  }
}

void compute_sections(const Model& model, Workspace& ws, double t) {
  update_speeds(model, ws, t);
  const Eigen::Index n = model.strips_per_wing();
  const Strips& st = model.strips();
  for (Eigen::Index k = 0; k < 2 * n; ++k) {
    const int s = k < n ? 0 : 1;
    const Eigen::Index i = k - s * n;
    ws.sections[static_cast<std::size_t>(k)] = section_state(
        ws.poses[static_cast<std::size_t>(s)], model.motion(static_cast<Side>(s)), st.radius(i),
        st.chord(i), st.leading_edge(i), st.cos_twist(i), st.sin_twist(i));
  }
}

}  // namespace flapline
