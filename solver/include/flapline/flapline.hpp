#pragma once
/// \file
/// flapline's installed API in one header: build a Model (in code from a ModelSpec, or from a
/// YAML config with io::load_model / io::CaseLoader), run it (simulate, run_case, CaseRunner),
/// read the RunSummary (cycle means, power, derived quantities; the frozen key paths of
/// summary_keys), write result files (io writers), and run studies (sweeps, trim, derivatives,
/// modes). Everything is in namespace flapline (io: flapline::io, studies: flapline::studies).

#include "flapline/version.hpp"

#include "flapline/common/enum_names.hpp"
#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"

#include "flapline/case/aero_options.hpp"
#include "flapline/case/atmosphere.hpp"
#include "flapline/case/model.hpp"
#include "flapline/case/simulation_options.hpp"
#include "flapline/case/vehicle.hpp"
#include "flapline/geometry/planform.hpp"
#include "flapline/geometry/strips.hpp"
#include "flapline/kinematics/gait.hpp"
#include "flapline/kinematics/waveform.hpp"

#include "flapline/simulation/run.hpp"
#include "flapline/simulation/run_summary.hpp"
#include "flapline/simulation/summary_keys.hpp"

#include "flapline/studies/derivatives.hpp"
#include "flapline/studies/design.hpp"
#include "flapline/studies/modes.hpp"
#include "flapline/studies/runner.hpp"
#include "flapline/studies/table.hpp"
#include "flapline/studies/trim.hpp"

#include "flapline/io/config.hpp"
#include "flapline/io/local_studies.hpp"
#include "flapline/io/sweep.hpp"
#include "flapline/io/writers.hpp"

#include "flapline/samples/samples.hpp"
