#include "flapline/aero/lifting_line.hpp"

#include <algorithm>
#include <array>
#include <atomic>
#include <cassert>
#include <vector>

#include "flapline/aero/lag_states.hpp"
#include "flapline/aero/section_loads.hpp"
#include "flapline/aero/vortex_filament.hpp"
#include "flapline/case/model.hpp"
#include "flapline/case/stage_kinematics.hpp"
#include "flapline/case/workspace.hpp"
#include "flapline/common/huge_block.hpp"
#include "flapline/common/math.hpp"

namespace flapline {
namespace {

constexpr double kCoreFraction = 0.01;  // δ = 1 % of the strip width (DESIGN §4)

/// Bytes that the per-phase factors of all lifting-line runs of this process hold together
/// (simulation.cache_mib).
std::atomic<long long> cache_bytes_in_use{0};

/// A share of the process budget, returned when released or destroyed.
class CacheLease {
 public:
  CacheLease() = default;
  CacheLease(const CacheLease&) = delete;
  CacheLease& operator=(const CacheLease&) = delete;
  ~CacheLease() { release(); }
  /// Takes up to `want` bytes of what the budget still allows; returns the bytes held.
  long long request(long long want, long long budget) {
    release();
    long long used = cache_bytes_in_use.load();
    for (;;) {
      const long long grant = std::max(0LL, std::min(want, budget - used));
      if (grant == 0) return 0;
      if (cache_bytes_in_use.compare_exchange_weak(used, used + grant)) {
        held_ = grant;
        return grant;
      }
    }
  }
  void release() {
    if (held_ > 0) cache_bytes_in_use.fetch_sub(held_);
    held_ = 0;
  }

 private:
  long long held_ = 0;
};

/// Per-run buffers of the lifting line.
struct LiftingLineScratch final : AeroScratch {
  HorseshoeGeometry geometry;
  Eigen::MatrixXd K, S, S2, identity;
  Eigen::PartialPivLU<Eigen::MatrixXd> lu, lu2;
  Eigen::VectorXd rhs, gamma, y_sum, y_difference, y_work;
  Eigen::ArrayXd forcing, p, d0;  // f; πc; (1 − A₁ − A₂)πc
  std::array<bool, 2> own_constant{false, false}, own_ready{false, false};
  std::array<Eigen::MatrixXd, 2> own_block;
  /// Both wings take the same angles at every instant: the geometry is mirror-symmetric and the
  /// system splits into a symmetric and an antisymmetric half of N strips each.
  bool mirror = false;
  bool direct = false;  ///< model.line_solve = direct
  /// Per stage phase: the LU factors of I − D₀(K_RR ± K_RL) (mirror: the + half in the left N
  /// columns, the − half in the right ones) or of I − D₀K (rows × 2N doubles from `factors`), and
  /// their row permutations (2N indices from `pivots`). Filled during the first cycle; phases past
  /// the budget are factorised afresh at each stage.
  HugeBlock store;
  double* factors = nullptr;
  std::vector<int> pivots;
  Eigen::Index factor_rows = 0;
  std::vector<char> filled;
  Eigen::Index cached_slots = 0;  ///< slots [0, cached_slots) may be cached
  Eigen::Index phase_slots = 0;   ///< stage phases per cycle (0: no phase cache)
  CacheLease lease;
  bool static_geometry = false;
};

LiftingLineScratch& scratch_of(Workspace& ws) {
  assert(ws.aero_scratch && ws.aero_scratch->kind == ModelKind::lifting_line &&
         "the lifting line runs on a Workspace attached to it (attach_aero)");
  return static_cast<LiftingLineScratch&>(*ws.aero_scratch);
}

/// Own-wing block of `side` into K (reused while the wing keeps its span ratio).
void assemble_own(const Model& model, LiftingLineScratch& s, std::size_t side) {
  const Eigen::Index n = model.strips_per_wing();
  const Eigen::Index o = static_cast<Eigen::Index>(side) * n;
  if (s.own_constant[side] && s.own_ready[side]) {
    s.K.block(o, o, n, n) = s.own_block[side];
    return;
  }
  influence_block(s.geometry, o, n, o, n, s.K.block(o, o, n, n));
  if (s.own_constant[side]) {
    s.own_block[side] = s.K.block(o, o, n, n);
    s.own_ready[side] = true;
  }
}

/// K at the poses in ws.poses, for the model's span coupling. `half`: only the blocks the mirror
/// split reads (K_RR and K_RL).
void assemble(const Model& model, Workspace& ws, LiftingLineScratch& s, bool half = false) {
  const Eigen::Index n = model.strips_per_wing();
  const SpanCoupling coupling = model.aero_options().span_coupling;
  if (coupling == SpanCoupling::none) {
    s.K.setZero();
    return;
  }
  horseshoe_geometry(model, ws, s.geometry);
  assemble_own(model, s, 0);
  if (!half) assemble_own(model, s, 1);
  if (coupling == SpanCoupling::both_wings) {
    influence_block(s.geometry, 0, n, n, n, s.K.block(0, n, n, n));
    if (!half) influence_block(s.geometry, n, n, 0, n, s.K.block(n, 0, n, n));
  } else {
    s.K.block(0, n, n, n).setZero();
    s.K.block(n, 0, n, n).setZero();
  }
}

/// Factorises the system at the poses in ws.poses: mirror halves into lu (+) and lu2 (−), or the
/// whole of I − D₀K into lu.
void factorise(const Model& model, Workspace& ws, LiftingLineScratch& s) {
  const Eigen::Index n = model.strips_per_wing();
  if (s.mirror) {
    assemble(model, ws, s, true);
    const auto own = s.K.topLeftCorner(n, n), cross = s.K.topRightCorner(n, n);
    const auto d = s.d0.head(n).matrix().asDiagonal();
    s.S2.setIdentity(n, n);
    s.S2.noalias() -= d * own;
    s.S = s.S2;
    s.S.noalias() -= d * cross;   // I − D₀(K_RR + K_RL)
    s.S2.noalias() += d * cross;  // I − D₀(K_RR − K_RL)
    s.lu.compute(s.S);
    s.lu2.compute(s.S2);
    return;
  }
  assemble(model, ws, s);
  s.S = s.identity;
  s.S.noalias() -= s.d0.matrix().asDiagonal() * s.K;
  s.lu.compute(s.S);
}

/// Solves LU y = P r in place (y holds r on entry) with partial-pivoting factors and the row
/// permutation as indices ((P r)[perm[i]] = r[i]).
void solve_with(const Eigen::Ref<const Eigen::MatrixXd>& factors, const int* perm,
                Eigen::VectorXd& y, Eigen::VectorXd& work) {
  for (Eigen::Index i = 0; i < y.size(); ++i) work(perm[i]) = y(i);
  factors.triangularView<Eigen::UnitLower>().solveInPlace(work);
  factors.triangularView<Eigen::Upper>().solveInPlace(work);
  y.swap(work);
}

/// Γ from s.rhs with LU factors: the whole system's (`sum` only) or the mirror halves'.
void solve_factors(const Model& model, LiftingLineScratch& s,
                   const Eigen::Ref<const Eigen::MatrixXd>& lu_sum, const int* perm_sum,
                   const Eigen::Ref<const Eigen::MatrixXd>& lu_difference,
                   const int* perm_difference) {
  const Eigen::Index n = model.strips_per_wing();
  if (!s.mirror) {
    s.y_sum = s.rhs;
    solve_with(lu_sum, perm_sum, s.y_sum, s.y_work);
    s.gamma = s.y_sum;
    return;
  }
  s.y_sum = 0.5 * (s.rhs.head(n) + s.rhs.tail(n));
  s.y_difference = 0.5 * (s.rhs.head(n) - s.rhs.tail(n));
  solve_with(lu_sum, perm_sum, s.y_sum, s.y_work);
  solve_with(lu_difference, perm_difference, s.y_difference, s.y_work);
  s.gamma.head(n) = s.y_sum + s.y_difference;
  s.gamma.tail(n) = s.y_sum - s.y_difference;
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
  if (s.direct) {  // the reference: K and its factors afresh, f = w + KΓ as a product
    if (!poses_current) update_speeds(model, ws, t);
    assemble(model, ws, s);
    s.S = s.identity;
    s.S.noalias() -= s.d0.matrix().asDiagonal() * s.K;
    s.lu.compute(s.S);
    s.gamma = s.lu.solve(s.rhs);
    s.forcing = w34;
    s.forcing.matrix().noalias() += s.K * s.gamma;
    return;
  }
  Eigen::Index slot = -1;
  if (s.static_geometry)
    slot = 0;
  else if (s.phase_slots > 0)
    slot = cycle_slot(t, model.frequency(), s.phase_slots);
  if (slot >= s.cached_slots) slot = -1;
  const Eigen::Index n = model.strips_per_wing(), rows = s.factor_rows;
  if (slot >= 0 && s.filled[static_cast<std::size_t>(slot)]) {
    const double* f = s.factors + slot * rows * 2 * n;
    const int* p = s.pivots.data() + slot * 2 * rows;
    using Block = Eigen::Map<const Eigen::MatrixXd>;
    if (s.mirror)
      solve_factors(model, s, Block(f, n, n), p, Block(f + n * n, n, n), p + n);
    else
      solve_factors(model, s, Block(f, rows, rows), p, Block(f, rows, rows), p);
  } else {
    if (!poses_current) update_speeds(model, ws, t);  // poses at t (stage arrays are not read)
    factorise(model, ws, s);
    const auto& minus = s.mirror ? s.lu2 : s.lu;  // the − half (mirror only)
    solve_factors(model, s, s.lu.matrixLU(), s.lu.permutationP().indices().data(), minus.matrixLU(),
                  minus.permutationP().indices().data());
    if (slot >= 0) {
      double* f = s.factors + slot * rows * 2 * n;
      int* p = s.pivots.data() + slot * 2 * rows;
      Eigen::Map<Eigen::MatrixXd>(f, rows, rows) = s.lu.matrixLU();
      Eigen::Map<Eigen::VectorXi>(p, rows) = s.lu.permutationP().indices();
      if (s.mirror) {
        Eigen::Map<Eigen::MatrixXd>(f + n * n, n, n) = s.lu2.matrixLU();
        Eigen::Map<Eigen::VectorXi>(p + n, n) = s.lu2.permutationP().indices();
      }
      s.filled[static_cast<std::size_t>(slot)] = 1;
    }
  }
  // (I − D₀K)Γ = r gives KΓ = (Γ − r)/D₀ without a product with K.
  s.forcing = w34 + (s.gamma.array() - s.rhs.array()) / s.d0;
}

/// Steady coupled solution at the poses in ws.poses: (I − PK)Γ = P w_¾, f = Γ/(πc).
void steady_forcing(const Model& model, Workspace& ws, const Eigen::ArrayXd& w34,
                    Eigen::ArrayXd& f) {
  LiftingLineScratch& s = scratch_of(ws);
  assemble(model, ws, s);
  Eigen::MatrixXd S = s.identity;  // not s.S: the mirror split keeps that at half size
  S.noalias() -= s.p.matrix().asDiagonal() * s.K;
  const Eigen::VectorXd rhs = (s.p * w34).matrix();
  const Eigen::VectorXd gamma = S.partialPivLu().solve(rhs);
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
    Eigen::Vector3d inner = to_body(
        quarter(st.edge_radius(0), st.edge_chord(0), st.edge_leading_edge(0), st.edge_twist(0)));
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
      g.control.col(k) =
          to_body(quarter(st.radius(i), st.chord(i), st.leading_edge(i), st.twist(i)));
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

namespace {
/// The per-phase factor cache for a run (within the process budget); every slot empty.
void allocate_factor_cache(const Model& model, LiftingLineScratch& s);
}  // namespace

std::unique_ptr<AeroScratch> LiftingLineModel::make_scratch(
    const Model& model, std::unique_ptr<AeroScratch> previous) const {
  auto s = std::make_unique<LiftingLineScratch>();
  if (previous && previous->kind == ModelKind::lifting_line) {
    // Keep the per-phase factors' allocations; prepare_run marks every slot empty.
    auto& old = static_cast<LiftingLineScratch&>(*previous);
    s->store = std::move(old.store);
    s->pivots = std::move(old.pivots);
  }
  const Eigen::Index n2 = model.strip_count(), n = model.strips_per_wing();
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  s->K.setZero(n2, n2);
  s->identity.setIdentity(n2, n2);
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
  s->direct = model.aero_options().line_solve == LineSolve::direct;
  s->mirror = !s->direct && model.mirror_gait();
  const Eigen::Index m = s->mirror ? n : n2;  // size of the systems factorised
  s->S.setZero(m, m);
  s->S2.setZero(m, m);
  s->lu = Eigen::PartialPivLU<Eigen::MatrixXd>(m);
  s->lu2 = Eigen::PartialPivLU<Eigen::MatrixXd>(m);
  s->y_sum.setZero(m);
  s->y_difference.setZero(m);
  s->y_work.setZero(m);
  s->static_geometry = !moving && model.aero_options().span_coupling != SpanCoupling::none;
  s->kind = ModelKind::lifting_line;
  // A fixed wing needs one slot, ready for code that steps without simulate() (prepare_run).
  if (s->static_geometry) allocate_factor_cache(model, *s);
  return s;
}

void LiftingLineModel::prepare_run(const Model& model, Workspace& ws) const {
  allocate_factor_cache(model, scratch_of(ws));
}

namespace {

void allocate_factor_cache(const Model& model, LiftingLineScratch& s) {
  s.filled.clear();
  s.cached_slots = s.phase_slots = 0;
  s.lease.release();
  if (s.direct || model.aero_options().span_coupling == SpanCoupling::none) return;
  if (!s.static_geometry && !model.periodic_kinematics()) return;
  const Eigen::Index n = model.strips_per_wing();
  const Eigen::Index rows = s.mirror ? n : 2 * n;
  const long long slot_bytes = (8LL * rows + 4LL) * 2 * n;
  const Eigen::Index slots = s.static_geometry ? 1 : 2 * model.simulation().steps_per_cycle;
  const long long budget = static_cast<long long>(model.simulation().cache_mib) * 1024 * 1024;
  const long long granted = s.lease.request(slot_bytes * slots, budget);
  s.phase_slots = s.static_geometry ? 0 : slots;
  s.cached_slots = static_cast<Eigen::Index>(granted / slot_bytes);
  // Slots are read only once filled, so reused memory needs no clearing.
  s.factor_rows = rows;
  s.factors = s.store.reserve(static_cast<std::size_t>(s.cached_slots * rows * 2 * n));
  s.pivots.resize(static_cast<std::size_t>(s.cached_slots * 2 * rows));
  s.filled.assign(static_cast<std::size_t>(s.cached_slots), 0);
}

}  // namespace

void LiftingLineModel::initial_state(const Model& model, Workspace& ws, double t, StartMode start,
                                     Eigen::VectorXd& x) const {
  const Eigen::Index n2 = model.strip_count();
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  x.setZero(2 * n2);
  if (start == StartMode::rest) return;
  if (start == StartMode::periodic) {
    // The periodic orbit for the forcing of the steady coupled solution at each instant: exact
    // when the coupling is quasi-steady, a close first guess otherwise.
    periodic_lag_state(
        model, ws,
        [&](double time, Eigen::ArrayXd& f) {
          update_speeds(model, ws, time);
          steady_forcing(model, ws, ws.w_three_quarter, f);
        },
        x);
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

void LiftingLineModel::own_induction(const Model& model, Workspace& ws, double t,
                                     Eigen::Ref<Eigen::ArrayXd> kappa) const {
  if (model.aero_options().span_coupling == SpanCoupling::none) {
    kappa.setZero();
    return;
  }
  LiftingLineScratch& s = scratch_of(ws);
  update_speeds(model, ws, t);
  horseshoe_geometry(model, ws, s.geometry);
  // Own horseshoe only: (I − D₀K)Γ = r with K ≈ diag(Kᵢᵢ) gives f = w + KᵢᵢΓ and
  // ∂f/∂(x₁ + x₂) = Kᵢᵢpᵢ/(1 − D₀ᵢKᵢᵢ).
  Eigen::Matrix<double, 1, 1> k;
  for (Eigen::Index i = 0; i < model.strip_count(); ++i) {
    influence_block(s.geometry, i, 1, i, 1, k);
    kappa(i) = k(0, 0) * s.p(i) / (1.0 - s.d0(i) * k(0, 0));
  }
}

bool LiftingLineModel::own_induction_varies(const Model& model) const {
  if (model.aero_options().span_coupling == SpanCoupling::none) return false;
  for (int side = 0; side < 2; ++side) {
    const Waveform& lambda = model.motion(static_cast<Side>(side)).span_ratio;
    if (lambda.maximum() != lambda.minimum()) return true;
  }
  return false;
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
