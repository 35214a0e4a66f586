#include "flapline/aero/lifting_line.hpp"

#include <array>
#include <cassert>
#include <vector>

#include "flapline/aero/lag_states.hpp"
#include "flapline/aero/section_loads.hpp"
#include "flapline/aero/vortex_filament.hpp"
#include "flapline/common/math.hpp"
#include "flapline/case/model.hpp"
#include "flapline/case/stage_kinematics.hpp"
#include "flapline/case/workspace.hpp"

namespace flapline {
namespace {

constexpr double kCoreFraction = 0.01;  // δ = 1 % of the strip width (DESIGN §4)

/// Per-run buffers of the lifting line.
struct LiftingLineScratch final : AeroScratch {
  HorseshoeGeometry geometry;
  Eigen::MatrixXd K, S, identity;
  Eigen::PartialPivLU<Eigen::MatrixXd> lu;
  Eigen::VectorXd rhs, gamma;
  Eigen::ArrayXd forcing, p, d0;  // f; πc; (1 − A₁ − A₂)πc
  std::array<bool, 2> own_constant{false, false}, own_ready{false, false};
  std::array<Eigen::MatrixXd, 2> own_block;
  // Per stage phase: G = (I − D₀K)⁻¹ and KG, filled during the first cycle (allocated by
  // prepare_run). With static geometry a single slot serves every time.
  std::vector<Eigen::MatrixXd> g_cache, kg_cache;
  std::vector<char> filled;
  bool static_geometry = false;
};

LiftingLineScratch& scratch_of(Workspace& ws) {
  assert(ws.aero_scratch && ws.aero_scratch->kind == ModelKind::lifting_line &&
         "the lifting line runs on a Workspace attached to it (attach_aero)");
  return static_cast<LiftingLineScratch&>(*ws.aero_scratch);
}


/// K at the poses in ws.poses, for the model's span coupling.
void assemble(const Model& model, Workspace& ws, LiftingLineScratch& s) {
  const Eigen::Index n = model.strips_per_wing();
  const SpanCoupling coupling = model.aero_options().span_coupling;
  if (coupling == SpanCoupling::none) {
    s.K.setZero();
    return;
  }
  horseshoe_geometry(model, ws, s.geometry);
  for (std::size_t side = 0; side < 2; ++side) {
    const Eigen::Index o = static_cast<Eigen::Index>(side) * n;
    if (s.own_constant[side] && s.own_ready[side]) {
      s.K.block(o, o, n, n) = s.own_block[side];
      continue;
    }
    influence_block(s.geometry, o, n, o, n, s.K.block(o, o, n, n));
    if (s.own_constant[side]) {
      s.own_block[side] = s.K.block(o, o, n, n);
      s.own_ready[side] = true;
    }
  }
  if (coupling == SpanCoupling::both_wings) {
    influence_block(s.geometry, 0, n, n, n, s.K.block(0, n, n, n));
    influence_block(s.geometry, n, n, 0, n, s.K.block(n, 0, n, n));
  } else {
    s.K.block(0, n, n, n).setZero();
    s.K.block(n, 0, n, n).setZero();
  }
}

/// Γ (into s.gamma) and the forcing f = w_¾ + KΓ (into s.forcing) for states x at time t.
/// `poses_current`: ws.poses already hold time t.
void solve_stage(const Model& model, Workspace& ws, double t, const Eigen::VectorXd& x,
                 const Eigen::Ref<const Eigen::ArrayXd>& w34, bool poses_current) {
  LiftingLineScratch& s = scratch_of(ws);
  const Eigen::Index n2 = model.strip_count();
  s.rhs.array() = s.d0 * w34 + s.p * (x.head(n2).array() + x.tail(n2).array());
  if (model.aero_options().span_coupling == SpanCoupling::none) {
    s.gamma = s.rhs;
    s.forcing = w34;
    return;
  }
  const Eigen::Index slot =
      s.static_geometry && !s.filled.empty()
          ? 0
          : cycle_slot(t, model.frequency(), static_cast<Eigen::Index>(s.filled.size()));
  if (slot < 0 || !s.filled[static_cast<std::size_t>(slot)]) {
    if (!poses_current) update_speeds(model, ws, t);  // poses at t (stage arrays are not read)
    assemble(model, ws, s);
    s.S = s.identity;
    s.S.noalias() -= s.d0.matrix().asDiagonal() * s.K;
    s.lu.compute(s.S);
    if (slot < 0) {
      s.gamma = s.lu.solve(s.rhs);
      s.forcing = w34;
      s.forcing.matrix().noalias() += s.K * s.gamma;
      return;
    }
    Eigen::MatrixXd& g = s.g_cache[static_cast<std::size_t>(slot)];
    g = s.lu.solve(s.identity);
    s.kg_cache[static_cast<std::size_t>(slot)].noalias() = s.K * g;
    s.filled[static_cast<std::size_t>(slot)] = 1;
  }
  s.gamma.noalias() = s.g_cache[static_cast<std::size_t>(slot)] * s.rhs;
  s.forcing = w34;
  s.forcing.matrix().noalias() += s.kg_cache[static_cast<std::size_t>(slot)] * s.rhs;
}

/// Steady coupled solution at the poses in ws.poses: (I − PK)Γ = P w_¾, f = Γ/(πc).
void steady_forcing(const Model& model, Workspace& ws, const Eigen::ArrayXd& w34,
                    Eigen::ArrayXd& f) {
  LiftingLineScratch& s = scratch_of(ws);
  assemble(model, ws, s);
  s.S = s.identity;
  s.S.noalias() -= s.p.matrix().asDiagonal() * s.K;
  const Eigen::VectorXd rhs = (s.p * w34).matrix();
  const Eigen::VectorXd gamma = s.S.partialPivLu().solve(rhs);
  f = gamma.array() / s.p;
}

}  // namespace

void horseshoe_geometry(const Model& model, const Workspace& ws, HorseshoeGeometry& g) {
  const Strips& st = model.strips();
  const Eigen::Index n = st.size();
  g.start.resize(3, 2 * n);
  g.end.resize(3, 2 * n);
  g.trailing_start.resize(3, 2 * n);
  g.trailing_end.resize(3, 2 * n);
  g.control.resize(3, 2 * n);
  g.normal.resize(3, 2 * n);
  g.core.resize(2 * n);
  for (int side = 0; side < 2; ++side) {
    const WingPose& p = ws.poses[static_cast<std::size_t>(side)];
    const bool left = side == 1;
    auto to_body = [left](const Eigen::Vector3d& v) { return left ? mirror(v) : v; };
    // Chord direction and ¼-chord point of a section at unscaled radius r (virtual frame).
    auto chord_axis = [&p](double twist) {
      return Eigen::Vector3d(std::cos(twist) * p.chord_axis + std::sin(twist) * p.normal_axis);
    };
    auto quarter = [&](double r, double chord, double le, double twist) {
      return Eigen::Vector3d(p.hinge + p.span_ratio * r * p.span_axis +
                             (le - 0.25 * chord) * chord_axis(twist));
    };
    Eigen::Vector3d inner = to_body(quarter(st.edge_radius(0), st.edge_chord(0),
                                            st.edge_leading_edge(0), st.edge_twist(0)));
    Eigen::Vector3d inner_leg = -to_body(chord_axis(st.edge_twist(0)));
    for (Eigen::Index i = 0; i < n; ++i) {
      const Eigen::Index k = side * n + i;
      const Eigen::Vector3d outer =
          to_body(quarter(st.edge_radius(i + 1), st.edge_chord(i + 1), st.edge_leading_edge(i + 1),
                          st.edge_twist(i + 1)));
      // Each leg leaves along −e_c at its own edge, so the legs that neighbouring strips shed at
      // a common edge coincide and cancel exactly, twisted wing or not.
      const Eigen::Vector3d outer_leg = -to_body(chord_axis(st.edge_twist(i + 1)));
      // The bound circulation runs along e_c × e_n: root to tip on the right wing, tip to root on
      // the left (DESIGN §4), so the pair's bound vortex is continuous across the body.
      g.start.col(k) = left ? outer : inner;
      g.end.col(k) = left ? inner : outer;
      g.trailing_start.col(k) = left ? outer_leg : inner_leg;
      g.trailing_end.col(k) = left ? inner_leg : outer_leg;
      inner = outer;
      inner_leg = outer_leg;
      const double ct = st.cos_twist(i), sn = st.sin_twist(i);
      g.normal.col(k) = to_body(Eigen::Vector3d(ct * p.normal_axis - sn * p.chord_axis));
      g.control.col(k) = to_body(quarter(st.radius(i), st.chord(i), st.leading_edge(i), st.twist(i)));
      g.core(k) = kCoreFraction * p.span_ratio * st.width(i);
    }
  }
}

void influence_block(const HorseshoeGeometry& g, Eigen::Index row0, Eigen::Index rows,
                     Eigen::Index col0, Eigen::Index cols, Eigen::Ref<Eigen::MatrixXd> out) {
  constexpr double inv4pi = 1.0 / (4.0 * kPi);
  for (Eigen::Index jj = 0; jj < cols; ++jj) {
    const Eigen::Index j = col0 + jj;
    const Eigen::Vector3d a = g.start.col(j), b = g.end.col(j);
    const Eigen::Vector3d ua = g.trailing_start.col(j), ub = g.trailing_end.col(j);
    const double core = g.core(j);
    for (Eigen::Index ii = 0; ii < rows; ++ii) {
      const Eigen::Index i = row0 + ii;
      const Eigen::Vector3d x = g.control.col(i);
      // Legs: from far downstream into A (−leg), from B out to far downstream (+leg).
      Eigen::Vector3d v = leg_velocity_4pi(b, ub, x, core) - leg_velocity_4pi(a, ua, x, core);
      if (i != j) v += segment_velocity_4pi(a, b, x, core);  // own bound vortex: the 2D model's
      out(ii, jj) = inv4pi * g.normal.col(i).dot(v);
    }
  }
}

Eigen::Index LiftingLineModel::state_size(const Model& model) const {
  return 2 * model.strip_count();
}

std::unique_ptr<AeroScratch> LiftingLineModel::make_scratch(
    const Model& model, std::unique_ptr<AeroScratch> previous) const {
  auto s = std::make_unique<LiftingLineScratch>();
  if (previous && previous->kind == ModelKind::lifting_line) {
    // Keep the per-phase matrices' allocations; prepare_run marks every slot empty.
    auto& old = static_cast<LiftingLineScratch&>(*previous);
    s->g_cache = std::move(old.g_cache);
    s->kg_cache = std::move(old.kg_cache);
  }
  const Eigen::Index n2 = model.strip_count();
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  s->K.setZero(n2, n2);
  s->S.setZero(n2, n2);
  s->identity.setIdentity(n2, n2);
  s->lu = Eigen::PartialPivLU<Eigen::MatrixXd>(n2);
  s->rhs.setZero(n2);
  s->gamma.setZero(n2);
  s->forcing.setZero(n2);
  s->p = kPi * model.pair().chord;
  s->d0 = (1.0 - w.a1 - w.a2) * s->p;
  for (int side = 0; side < 2; ++side) {
    const Waveform& lambda = model.motion(static_cast<Side>(side)).span_ratio;
    s->own_constant[static_cast<std::size_t>(side)] = lambda.maximum() == lambda.minimum();
  }
  bool moving = false;
  for (int side = 0; side < 2; ++side) {
    const WingMotion& m = model.motion(static_cast<Side>(side));
    for (const Waveform* wave : {&m.stroke, &m.deviation, &m.pitch, &m.span_ratio})
      if (wave->maximum() != wave->minimum()) moving = true;
  }
  s->static_geometry = !moving && model.aero_options().span_coupling != SpanCoupling::none;
  if (s->static_geometry) {  // one slot, cheap: allocate now
    s->g_cache.assign(1, Eigen::MatrixXd::Zero(n2, n2));
    s->kg_cache.assign(1, Eigen::MatrixXd::Zero(n2, n2));
    s->filled.assign(1, 0);
  }
  s->kind = ModelKind::lifting_line;
  return s;
}

void LiftingLineModel::prepare_run(const Model& model, Workspace& ws) const {
  LiftingLineScratch& s = scratch_of(ws);
  if (s.static_geometry || !s.filled.empty()) return;
  const Eigen::Index n2 = model.strip_count();
  const std::size_t slots = static_cast<std::size_t>(2 * model.simulation().steps_per_cycle);
  const double bytes = 2.0 * 8.0 * static_cast<double>(n2 * n2) * static_cast<double>(slots);
  if (model.periodic_kinematics() && model.aero_options().span_coupling != SpanCoupling::none &&
      bytes <= 256.0 * 1024 * 1024) {
    // Slots are read only once filled, so reused matrices need no clearing.
    s.g_cache.resize(slots);
    s.kg_cache.resize(slots);
    for (std::size_t j = 0; j < slots; ++j) {
      s.g_cache[j].resize(n2, n2);
      s.kg_cache[j].resize(n2, n2);
    }
    s.filled.assign(slots, 0);
  } else {
    s.g_cache.clear();
    s.kg_cache.clear();
  }
}

void LiftingLineModel::initial_state(const Model& model, Workspace& ws, double t, StartMode start,
                                     Eigen::VectorXd& x) const {
  const Eigen::Index n2 = model.strip_count();
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  x.setZero(2 * n2);
  if (start == StartMode::rest) return;
  if (start == StartMode::periodic) {
    // The periodic orbit for the forcing of the steady coupled solution at each instant: exact
    // when the coupling is quasi-steady, a close first guess otherwise.
    periodic_lag_state(model, ws, [&](double time, Eigen::ArrayXd& f) {
      update_speeds(model, ws, time);
      steady_forcing(model, ws, ws.w_three_quarter, f);
    }, x);
    return;
  }
  // The discrete Prandtl solution at t: x_k = A_k f.
  update_speeds(model, ws, t);
  Eigen::ArrayXd f(n2);
  steady_forcing(model, ws, ws.w_three_quarter, f);
  x.head(n2) = (w.a1 * f).matrix();
  x.tail(n2) = (w.a2 * f).matrix();
}

void LiftingLineModel::derivative(const Model& model, Workspace& ws, double t,
                                  const Eigen::VectorXd& x, Eigen::VectorXd& dxdt) const {
  const StageSpeeds st = stage_speeds(model, ws, t);
  solve_stage(model, ws, t, x, st.w_three_quarter, false);
  lag_derivative(wagner_coefficients(model.aero_options().wagner_fit), st.rate,
                 scratch_of(ws).forcing, x, dxdt);
}

void LiftingLineModel::loads(const Model& model, Workspace& ws, double t,
                             const Eigen::VectorXd& x) const {
  solve_stage(model, ws, t, x, ws.w_three_quarter, true);
  const LiftingLineScratch& s = scratch_of(ws);
  ws.loads.w_effective = s.gamma.array() / s.p;
  ws.loads.w_induced = s.forcing - ws.w_three_quarter;
  circulation_loads(model, ws);
}

double LiftingLineModel::stiffest_rate(const Model& model, Workspace& ws, double t) const {
  // The coupling adds A_k·KMP (eigenvalues within [−2A_k, 0]) to each state's −1: bounded by
  // Σ b_k(1 + 2A_k) per unit U/b.
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  update_speeds(model, ws, t);
  return (w.b1 * (1 + 2 * w.a1) + w.b2 * (1 + 2 * w.a2)) * ws.rate.maxCoeff();
}

Eigen::MatrixXd influence_matrix(const Model& model, Workspace& ws, double t) {
  const Eigen::Index n2 = model.strip_count();
  if (model.aero_options().kind != ModelKind::lifting_line) return Eigen::MatrixXd::Zero(n2, n2);
  attach_aero(model, ws);
  update_speeds(model, ws, t);
  LiftingLineScratch& s = scratch_of(ws);
  assemble(model, ws, s);
  return s.K;
}

StateSpace frozen_state_space(const Model& model, Workspace& ws, double t) {
  const Eigen::Index n2 = model.strip_count();
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  update_speeds(model, ws, t);
  const Eigen::MatrixXd K = influence_matrix(model, ws, t);
  const Eigen::VectorXd p = (kPi * model.pair().chord).matrix();
  const Eigen::VectorXd d0 = (1.0 - w.a1 - w.a2) * p;
  // Γ = M(D₀w + P(x₁ + x₂)), M = (I − D₀K)⁻¹; f = w + KΓ.
  const Eigen::MatrixXd M =
      (Eigen::MatrixXd::Identity(n2, n2) - d0.asDiagonal() * K).partialPivLu().inverse();
  const Eigen::MatrixXd MP = M * p.asDiagonal();
  const Eigen::MatrixXd MD = M * d0.asDiagonal();
  const Eigen::MatrixXd KMP = K * MP;
  const Eigen::MatrixXd F = Eigen::MatrixXd::Identity(n2, n2) + K * MD;  // ∂f/∂w
  const Eigen::MatrixXd I = Eigen::MatrixXd::Identity(n2, n2);
  const Eigen::VectorXd rate = ws.rate.matrix();
  StateSpace ss;
  ss.time = t;
  ss.A.resize(2 * n2, 2 * n2);
  ss.B.resize(2 * n2, n2);
  const Eigen::MatrixXd R1 = (w.b1 * rate).asDiagonal(), R2 = (w.b2 * rate).asDiagonal();
  ss.A.block(0, 0, n2, n2) = R1 * (-I + w.a1 * KMP);
  ss.A.block(0, n2, n2, n2) = R1 * (w.a1 * KMP);
  ss.A.block(n2, 0, n2, n2) = R2 * (w.a2 * KMP);
  ss.A.block(n2, n2, n2, n2) = R2 * (-I + w.a2 * KMP);
  ss.B.topRows(n2) = R1 * (w.a1 * F);
  ss.B.bottomRows(n2) = R2 * (w.a2 * F);
  ss.C.resize(n2, 2 * n2);
  ss.C << MP, MP;
  ss.D = MD;
  return ss;
}

}  // namespace flapline
