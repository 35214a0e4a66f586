#include "flapline/simulation/drive.hpp"

#include "flapline/case/model.hpp"
#include "flapline/case/workspace.hpp"
#include "flapline/common/math.hpp"

namespace flapline {
namespace {

/// Sums over one wing's mass elements (virtual frame).
struct MassSums {
  Eigen::Vector3d force = Eigen::Vector3d::Zero();          ///< Σ m a
  Eigen::Vector3d hinge_moment = Eigen::Vector3d::Zero();   ///< Σ (d × m a + Ḣ), d = x − h
  Eigen::Vector3d origin_moment = Eigen::Vector3d::Zero();  ///< Σ (x × m a + Ḣ)
  double span = 0.0;                                 ///< Σ m a·∂x/∂λ + the stretching term
  Eigen::Vector3d weight = Eigen::Vector3d::Zero();  ///< Σ m g
  Eigen::Vector3d weight_moment = Eigen::Vector3d::Zero();  ///< Σ d × m g
  double weight_span = 0.0;                                 ///< Σ m g·∂x/∂λ
};

MassSums mass_sums(const MassElements& me, const WingMotion& m, const WingPose& p,
                   const Eigen::Vector3d& g) {
  MassSums out;
  const Eigen::Vector3d& W = m.rates;  // body rates, constant in body axes
  const Eigen::Vector3d& wr = p.omega_rel;
  const Eigen::Vector3d& wr_dot = p.omega_rel_dot;     // body-frame derivative
  const Eigen::Vector3d& w = p.omega;                  // absolute rate of the wing
  const Eigen::Vector3d w_dot = wr_dot + W.cross(wr);  // its inertial derivative
  const double lam = p.span_ratio, lam_d = p.span_ratio_rate, lam_dd = p.span_ratio_accel;
  const Eigen::Vector3d& es = p.span_axis;
  const Eigen::Vector3d es_rel = wr.cross(es);
  const double w_perp_sq = w.squaredNorm() - w.dot(es) * w.dot(es);
  // Acceleration of the body frame's points: Ω × (Ω × x) + Ω × V (V, Ω constant in body axes).
  const Eigen::Vector3d frame_base = W.cross(m.velocity);
  for (Eigen::Index e = 0; e < me.size(); ++e) {
    const double mass = me.mass(e), r = me.radius(e), l = me.offset(e);
    if (mass == 0.0) continue;
    const Eigen::Vector3d ec = me.cos_twist(e) * p.chord_axis + me.sin_twist(e) * p.normal_axis;
    const Eigen::Vector3d en = me.cos_twist(e) * p.normal_axis - me.sin_twist(e) * p.chord_axis;
    const Eigen::Vector3d d = lam * r * es + l * ec;
    const Eigen::Vector3d x = p.hinge + d;
    const Eigen::Vector3d v_rel = p.hinge_velocity + lam_d * r * es + wr.cross(d);
    const Eigen::Vector3d a_rel = p.hinge_accel + lam_dd * r * es + 2.0 * lam_d * r * es_rel +
                                  wr_dot.cross(d) + wr.cross(wr.cross(d));
    const Eigen::Vector3d a = a_rel + 2.0 * W.cross(v_rel) + W.cross(W.cross(x)) + frame_base;
    const Eigen::Vector3d ma = mass * a;
    // Thin strip about its centre of mass: I_s = m c²/12, I_c = m(λΔr)²/12, I_n = I_s + I_c;
    // Ḣ = Iω̇ + ω × Iω + İ_local ω, with İ_c = İ_n = 2(mΔr²/12)λλ̇.
    const double i_s = me.chord_inertia(e), j = me.stretch_inertia(e);
    const double i_c = j * lam * lam, i_n = i_s + i_c;
    auto inertia = [&](const Eigen::Vector3d& v) -> Eigen::Vector3d {
      return i_s * es.dot(v) * es + i_c * ec.dot(v) * ec + i_n * en.dot(v) * en;
    };
    const Eigen::Vector3d h_dot = inertia(w_dot) + w.cross(inertia(w)) +
                                  2.0 * j * lam * lam_d * (ec.dot(w) * ec + en.dot(w) * en);
    out.force += ma;
    out.hinge_moment += d.cross(ma) + h_dot;
    out.origin_moment += x.cross(ma) + h_dot;
    // ∂x/∂λ = r e_s; the strip's own stretching adds (mΔr²/12)(λ̈ − λ|ω × e_s|²).
    out.span += r * ma.dot(es) + j * (lam_dd - lam * w_perp_sq);
    const Eigen::Vector3d mg = mass * g;
    out.weight += mg;
    out.weight_moment += d.cross(mg);
    out.weight_span += r * mg.dot(es);
  }
  return out;
}

}  // namespace

void add_drive(const Model& model, const Workspace& ws, const std::array<Wrench, 2>& virtual_wrench,
               const std::array<double, 2>& span_load, LoadSample& out) {
  const bool with_weight = model.vehicle().has_value();
  const Eigen::Vector3d g = with_weight
                                ? gravity_body(model.vehicle()->roll, model.vehicle()->pitch)
                                : Eigen::Vector3d::Zero();
  const Eigen::Vector3d down(0.0, 0.0, 1.0);
  out.inertial = Wrench{};
  out.power_mechanical = out.power_inertial = 0.0;
  for (int s = 0; s < 2; ++s) {
    const std::size_t si = static_cast<std::size_t>(s);
    const WingMotion& m = model.motion(static_cast<Side>(s));
    const WingPose& p = ws.poses[si];
    WingDriveSample& d = out.drive[si];
    d = WingDriveSample{};
    d.rate = {p.stroke_rate, p.deviation_rate, p.pitch_rate, p.span_ratio_rate, p.plunge_rate};
    // Joint axes: ω_rel = φ̇ u_φ + θ̇ u_θ + ψ̇ u_ψ with u_φ = R_β(−z), u_θ = −R_β R_z(−φ)x,
    // u_ψ = e_s (wing_pose, DESIGN §2).
    const std::array<Eigen::Vector3d, 3> axis{m.stroke_plane * Eigen::Vector3d(0.0, 0.0, -1.0),
                                              -(m.stroke_plane * rotation_z(-p.stroke).col(0)),
                                              p.span_axis};
    const Wrench& w = virtual_wrench[si];
    const Eigen::Vector3d moment = w.moment - p.hinge.cross(w.force);  // about the hinge
    const Eigen::Vector3d& force = w.force;
    const double span = span_load[si];
    for (int a = 0; a < 3; ++a) d.torque_aero[static_cast<std::size_t>(a)] = -axis[a].dot(moment);
    d.torque_aero[3] = -span;
    d.torque_aero[4] = -force.dot(down);
    if (model.mass().size() > 0) {
      const MassSums ms = mass_sums(model.mass(), m, p, s == 0 ? g : mirror(g));
      for (int a = 0; a < 3; ++a) {
        d.torque_inertial[static_cast<std::size_t>(a)] = axis[a].dot(ms.hinge_moment);
        d.torque_gravity[static_cast<std::size_t>(a)] = -axis[a].dot(ms.weight_moment);
      }
      d.torque_inertial[3] = ms.span;
      d.torque_inertial[4] = ms.force.dot(down);
      d.torque_gravity[3] = -ms.weight_span;
      d.torque_gravity[4] = -ms.weight.dot(down);
      const Eigen::Vector3d fi = -ms.force, mi = -ms.origin_moment;
      d.inertial.force = s == 0 ? fi : mirror(fi);
      d.inertial.moment = s == 0 ? mi : mirror_axial(mi);
      out.inertial += d.inertial;
    }
    for (std::size_t j = 0; j < static_cast<std::size_t>(kJoints); ++j) {
      d.torque[j] = d.torque_aero[j] + d.torque_inertial[j] + d.torque_gravity[j];
      d.joint_power[j] = d.torque[j] * d.rate[j];
      d.power += d.joint_power[j];
      d.power_inertial += d.torque_inertial[j] * d.rate[j];
    }
    out.power_mechanical += d.power;
    out.power_inertial += d.power_inertial;
  }
}

}  // namespace flapline
