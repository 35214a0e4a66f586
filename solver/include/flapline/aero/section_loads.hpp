#pragma once
/// \file
/// Section load formulas shared by every model (DESIGN §4). Per unit span, for strip i with chord
/// c, semichord b = c/2, m_a = πρc²/4, ω_s the section pitch rate:
///  - circulatory normal force ρΓU_t e_n at the ¼-chord point, Γ = πc·w_E;
///  - leading-edge suction η_s πρc w_S² e_c, w_S = w_E − ω_s c/4;
///  - optional vortex lift κ_v πρc w_S|w_S| e_n at the ¼-chord point (η_s = 0 only);
///  - added mass m_a d(w_½)/dt e_n at mid-chord;
///  - optional profile drag ½ρC_D0 c U² along the in-section air velocity, at mid-chord;
///  - couple [−(π/2)ρU_t b³ω_s − (π/8)ρb⁴ω̇_s] e_s (Theodorsen 1935, NACA Report 496).
/// All vectors are in the virtual right-wing frame of the strip's wing; values are per strip
/// (per unit span × strip width).

namespace flapline {

class Model;
class Workspace;

/// Loads from the effective normal-wash ws.loads.w_effective (one entry per strip). With
/// reverse_flow = no_suction the suction is dropped where U_t < 0.
void circulation_loads(const Model& model, Workspace& ws);

/// Loads of the quasi-steady revolving-wing fit: ½ρU²c·C_L(α), C_D(α) with U, α from the pitch
/// axis velocity, plus the rotational force π(¾ − x₀)ρUc²ω_s (Sane & Dickinson 2002), added mass
/// and couple.
void revolving_fit_loads(const Model& model, Workspace& ws);

/// Added-mass force and non-circulatory couple of strip k (shared by both laws).
void add_noncirculatory_loads(const Model& model, Workspace& ws);

/// Profile drag ½ρC_D0 c U² per unit span along the in-section air velocity relative to
/// mid-chord, acting there (model.profile_drag); added to force_mid.
void add_profile_drag(const Model& model, Workspace& ws);

}  // namespace flapline
