/**
 * Every error code speedband reports, with one line of meaning: what happened and what the user
 * does about it. A `SpeedbandError` takes only these codes (`ErrorCode`); under `--json` the CLI
 * reports the code ({"error": {"code", …}}), and docs/errors.md lists them all (generated:
 * `npm run error-reference`). Codes are `stage.problem`, grouped below by stage in pipeline order
 * (the stages of src/core/error-reference.ts) and sorted inside a stage; `internal` alone is a bug.
 */

export const ERROR_CODES = {
  // Files and JSON text
  'file.unreadable': 'An input file cannot be read (missing, a folder, no permission): check the path.',
  'json.duplicateKey': 'A JSON object names the same key twice, so which value counts is unclear: keep one of them.',
  'json.syntax': 'A JSON input is not valid JSON (the message gives the line): fix the syntax.',

  // Vehicle file and single-track model
  'vehicle.incompleteStiffness': "The vehicle file gives the nominal cornering stiffness of one axle only: add the other axle's, or remove both.",
  'vehicle.invalid': 'The vehicle file is not a JSON object or a field has the wrong type: fix the field at the JSON path named.',
  'vehicle.missingField':
    'The vehicle file lacks a required field (the message names a look-alike field if there is one): add it, in the unit its name states.',
  'vehicle.noCorneringStiffness':
    "The single-track model needs both axles' cornering stiffnesses and the vehicle file has none: add them, or identify them from step-test logs.",
  'vehicle.nonFiniteModel':
    "The vehicle's mass, inertia, distances and stiffnesses give a model with non-finite coefficients: check their magnitudes and units.",
  'vehicle.notFound':
    'The vehicle given is a folder without vehicle.json, or a name that is neither a path nor a bundled demo vehicle: give the path of vehicle.json or its folder.',
  'vehicle.outOfRange': 'A vehicle field is outside its physical range (e.g. a mass ≤ 0 kg): correct the value or its unit.',
  'vehicle.speedNotPositive': 'The single-track model was asked for a speed ≤ 0 m/s; its slip angles divide by speed: use a positive speed.',
  'vehicle.unknownField': 'The vehicle file has a field speedband does not know (the message suggests the closest): remove it or fix its spelling.',

  // Simulated test logs
  'simulate.invalidInput': 'The simulator was given mismatched lengths, a non-uniform time grid or bad limits: fix the simulation input named.',
  'simulate.unknownScenario': 'A scenario name speedband does not know: the message lists the ones it knows.',

  // Synthetic step-test logs (make-test-logs)
  'testLogs.amplitudeTooSmall': 'The automatic step amplitude rounds to 0° at this speed: give the amplitudes explicitly.',
  'testLogs.badAmplitude': "A step amplitude given is not between 0 and the vehicle's steer-angle limit: give positive amplitudes below the limit.",
  'testLogs.badOption': 'A test-log option is out of range (sample rate ≤ 0, negative noise or resolution, non-integer seed): give a value in range.',
  'testLogs.badSpeeds': 'The speed list is empty, has a speed ≤ 0 m/s, or two speeds that give the same file name: list each positive speed once.',
  'testLogs.unstableSpeed': "A test speed is at or above the oversteering vehicle's critical speed, so no step test can be run: choose lower speeds.",

  // Test logs
  'log.badColumnOption': 'A --column option is not CHANNEL=HEADER[:UNIT] with a known channel: write it as e.g. speed_mps=v:km/h.',
  'log.badOption': 'A log-reading or step-segmentation option is out of its range (the message gives the default): give a value in range.',
  'log.duplicateColumn': 'The log header names the column a channel needs twice: rename one so the channel is unambiguous.',
  'log.duplicateTime': 'Two log rows have the same time_s: remove the duplicate sample.',
  'log.empty': 'The log file is empty: give a CSV with a header line and data rows.',
  'log.emptyCell': 'A cell of a column the reader uses is empty: fill it or remove the row.',
  'log.extraCell': 'A log row has more cells than the header: remove the extra cells or name them in the header.',
  'log.headerOnly': 'The log has a header but fewer than two data rows: check that the logger wrote its data.',
  'log.implausibleValue':
    "A log value is outside the plausible range of its channel, often a unit mix-up: check the column's unit (--column CHANNEL=HEADER:UNIT).",
  'log.missingCell': 'A log row has fewer cells than the header: complete or remove the row.',
  'log.missingColumn':
    'A column the reader needs is not in the header (the message names the closest header): add or rename it, or map it with --column or a log profile.',
  'log.nonFinite': 'A log cell holds NaN or Infinity, so the logger recorded no valid value: remove the row or cut the log around it.',
  'log.nonNumeric': 'A log cell is not a decimal number (or uses a decimal comma): write numbers with a decimal point, or remove the row.',
  'log.profileInvalid': 'The log profile file does not match its schema: fix the field at the JSON path named.',
  'log.steeringRatioRequired':
    'The steering column is a steering-wheel angle and no valid steering ratio was given: pass --vehicle FILE or --steering-ratio N.',
  'log.timeNotIncreasing': 'time_s goes backwards in the log: sort the log or split it.',
  'log.unitMismatch': 'The unit given for a channel measures another quantity (e.g. a length for a speed): give a unit of the right kind.',
  'log.unitNotResolved': 'A column unit reached the reader without conversion (library use): pass the column map through resolveColumnUnits first.',
  'log.unknownUnit': 'The unit given for a column is not a unit speedband can read: give one such as km/h, deg or rad/s.',

  // Identification
  'identify.channelScale':
    "The logs disagree with the vehicle's kinematics, usually a channel in the wrong unit or scale: fix the channel's unit with --column.",
  'identify.duplicateLog': 'Two logs given have the same content, which would count their steps twice: give each log once.',
  'identify.noLogs': 'No CSV log was found at the paths given: give log files or folders holding .csv logs.',
  'identify.noSteps': 'No usable step-steer event was found in the logs: log open-loop steps held until the yaw rate settles.',
  'identify.tooFewSpeeds': 'Usable steps were found at fewer than two speeds, and a speed schedule needs two: log steps at more speeds.',

  // Models file
  'models.invalid': 'The models file does not match its schema: use the file speedband identify wrote, unedited.',
  'models.unsupportedVersion': 'The models file was written in a format version this speedband does not read: run speedband identify again.',
  'models.wrongFormat': 'The file given as models is not a speedband models file: give the file written by speedband identify.',

  // Linear models: transfer functions, delays, responses (mostly library use)
  'lti.delayInLoop': 'Unity feedback was asked of a loop with a dead time: replace the delay by a Padé approximant first.',
  'lti.improperTransferFunction': 'A state-space form was asked of a transfer function with more zeros than poles: add a derivative filter or poles.',
  'lti.invalidFrequencyGrid': 'A frequency grid is not 0 < low < high with at least two points: give a valid grid.',
  'lti.invalidInput': 'A time-response input has another length than the time grid, or a non-finite sample: give one finite value per time.',
  'lti.invalidPade': 'A Padé approximant was asked for a negative or non-finite delay, frequency or order: give finite values ≥ 0.',
  'lti.invalidTimeGrid': 'A time grid is empty, non-finite or not strictly increasing: sort the times and remove repeats.',
  'lti.invalidTransferFunction': 'A transfer function has an empty, non-finite or zero polynomial or a negative delay: fix its coefficients.',
  'lti.nonFiniteCoefficient': 'A polynomial whose roots are needed has non-finite coefficients: check the model that produced it.',
  'lti.padeOrderTooHigh': 'The delay is too long for a Padé approximant over the band asked: analyse with the exact delay, or narrow the band.',
  'lti.unequalDelays': 'Two transfer functions with different delays were connected in parallel: replace the delays by Padé approximants first.',
  'lti.zeroPolynomial': 'The roots of the zero polynomial were asked: give at least one non-zero coefficient.',

  // Loops
  'loops.invalidPreview':
    'The preview distance or time of a path loop is negative or not finite, or a front-axle reference lacks the axle distance: fix the loop settings.',
  'loops.invalidSpeed': 'A loop plant was asked at a speed ≤ 0 m/s: use a forward speed above 0.',
  'loops.unknownKind': 'The loop kind is not yaw-rate, heading or path: choose one of them.',

  // Controller
  'controller.derivativeFilterUndefined': 'A pure derivative controller (kp = ki = 0) has no derivative time to set the filter from: give kp ≠ 0 or no filter.',
  'controller.invalidGains': 'A PID gain or time is not finite (or an integral time ≤ 0 s): give finite gains.',
  'controller.invalidSettings': 'The controller settings are out of range (sample time, derivative filter, latency or discretisation): fix the value named.',
  'controller.mixedSigns': 'kp, ki and kd are not all of one sign, which gives a negative integral or derivative time: give gains of one sign.',
  'controller.noIdealForm': 'A PID with kp = 0 has no ideal or series form: keep it in the parallel form.',
  'controller.noSeriesForm': 'A PID with Ti < 4·Td has complex zeros and no series form: keep the parallel or ideal form, or retune.',

  // Tuning rules
  'tuning.invalidParameter': 'A tuning-rule parameter is out of its range (e.g. a sensitivity-peak target ≤ 1): give a value in range.',
  'tuning.noSteadyState':
    'The yaw-rate response has no finite steady state, so the first-order-plus-dead-time fit the rule needs does not exist: check the model.',
  'tuning.notConfirmed': 'The exact analysis of the sampled loop does not confirm the MIGO design: choose another rule, and report the loop.',
  'tuning.parameterNotTaken': 'A parameter was given that the chosen tuning rule does not take: remove it or choose another rule.',
  'tuning.parameterRequired': 'The chosen tuning rule needs a parameter that cannot be derived here: give it explicitly.',
  'tuning.ruleNotApplicable': 'The chosen tuning rule does not apply to this plant (the message lists the rules that do): choose one of those.',
  'tuning.targetNotReachable': 'The damping target asks for a natural frequency the path loop cannot reach with this lead: lower the target.',
  'tuning.unknownRule': 'No tuning rule of that name (the message suggests the closest): choose a listed rule.',
  'tuning.unstablePlant':
    'The yaw-rate response is unstable at this speed (oversteer above the critical speed?): lower the speed or check the cornering stiffnesses.',

  // Plan file
  'plan.invalid': 'The plan file, or a speed-varying parameter in it, is not valid (the message names the JSON path and docs/plan.md the fields): fix it.',
  'plan.parameterNotTaken': "The plan gives a rule parameter the plan's rule does not take: remove it or change the rule.",

  // Building a schedule
  'build.noModel': 'The lumped model has no speeds to interpolate between: identify at least two test speeds.',
  'build.otherVehicle':
    'The models were identified with another vehicle file than the one given: give that file, identify again, or pass --allow-other-vehicle.',

  // Schedule table and file
  'schedule.breakpointNotChecked': 'A breakpoint is not among the checked speeds (library use): build the check grid from the breakpoints.',
  'schedule.checksumMismatch':
    'The schedule file changed since it was written: do not load it into firmware; rebuild it, restore it, or re-verify a deliberate edit with speedband reverify.',
  'schedule.densityInvalid': 'The check density is not a whole number ≥ 2: give a whole number of speeds.',
  'schedule.invalid': 'The schedule file does not match its schema or contradicts itself (status against check result): rebuild the schedule.',
  'schedule.notSerialisable': 'A schedule value has no JSON form (a non-finite number): a value upstream is wrong; rebuild, and report it if it persists.',
  'schedule.rangeInvalid': 'The check speed range is not finite with maximum above minimum: give a valid range.',
  'schedule.speedNotFinite': 'A gain lookup was asked at a non-finite speed: give a finite speed in m/s.',
  'schedule.tableInvalid': 'The gain table is empty, its rows do not match its speeds, or a speed or gain is not finite or not increasing: fix the table.',
  'schedule.tableShape': 'An interpolation was given another number of values than speeds: give one value per speed.',
  'schedule.unsupportedVersion': 'The schedule file was written in an earlier format version: rebuild it with speedband build.',

  // Checking a schedule
  'check.delayTooLong': "The loop's dead time is longer than the analysis handles, usually a unit mistake: check the latency, sample time and actuator delay.",
  'check.noModel': 'The schedule records no vehicle model speedband can rebuild: give the model with --models models.json or --logs.',
  'check.variationsModelMismatch':
    "The schedule's variation set varies another kind of model than the one the check runs on: check on the model the schedule was built on, or rebuild it.",

  // Stability analysis
  'verify.analysisTooLarge':
    "The loop's delay is too long for the analysis (too many samples or phase turns), usually a unit mistake: check the delays and the sample time.",
  'verify.improperLoop': 'The loop has more zeros than poles, so its gain grows without bound: add the derivative filter the firmware runs, or a plant lag.',
  'verify.invalidController':
    'The controller given for analysis is not valid (unknown form, non-finite or negative times, a non-causal discrete controller): fix the field named.',
  'verify.invalidLoop': 'The loop given for analysis has a non-finite coefficient, delay or sample time: fix the field named.',

  // Comparing schedules
  'compare.invalidThreshold': 'A comparison threshold is negative or not finite: give a finite number ≥ 0.',

  // The HTML report
  'report.logNotInModels':
    'A log given to the report is not one of the logs models.json was identified from (compared by SHA-256): give the logs of that identification, or leave --logs out.',
  'report.logsWithoutModels':
    'The report was given logs without models.json, which holds the fits it draws over them: give --models with --logs, or leave --logs out.',
  'report.modelsMismatch':
    'models.json is not the identification the schedule was built from (another vehicle file or other logs, by SHA-256): give the models.json of that build.',
  'report.speedOutOfRange': "A --response-speed-mps is outside the schedule's checked speed range: give speeds inside the range the message states.",

  // Export
  'export.checksumInvalid': 'The schedule given to the exporter has no valid checksum (library use): read the schedule with readSchedule first.',
  'export.fallbackInvalid': 'The fallback breakpoint is not a breakpoint of the table (library use): give an index inside the table.',
  'export.fixedPointOverflow': 'A gain does not fit the fixed-point format asked: use fewer fractional bits, a 32-bit word, or --q-format auto.',
  'export.fixedPointStepRange':
    'The fixed-point step could overflow for some int32 input, or kp is 0 where it divides (the message names term and gain): check the gains, or export floating point.',
  'export.noModel': 'The schedule records no model, so its gains cannot be re-checked before export: rebuild it, or pass --allow-failing for review only.',
  'export.notFinite': 'A value to export has no C form (not a finite number): rebuild the schedule.',
  'export.prefixInvalid': 'The C prefix is not a C identifier: use letters, digits and underscores, not starting with a digit, at most 63 characters.',
  'export.qFormatInvalid': 'The --q-format is not I.F with I + F = 16 or 32: write e.g. Q16.16, Q4.12 or auto.',

  // Writing outputs
  'output.exists': 'The output file exists with other content and was not replaced: pass --force, or choose another path.',
  'output.folderNotWritable': 'The output folder is not writable: choose another output path or fix its permissions.',
  'output.folderUnusable': 'The output folder cannot be used (e.g. no permission to look into it): choose another output path.',
  'output.isDirectory': 'The output path is a folder: give a file name inside it.',
  'output.isInput': 'An output path is an input of the same command, which is never replaced, not even with --force: choose another path.',
  'output.notFolder': 'The path given as an output folder is a file: give a folder (it is created when missing).',
  'output.notRegularFile': 'The output path is a device, pipe or socket: give a file path.',
  'output.parentNotFolder': 'A folder on the output path is a file, so nothing can be written under it: choose another output path.',
  'output.sameFile': 'Two outputs of the command name the same file: give each its own path.',
  'output.stdoutFailed': 'Standard output could not be written (closed pipe, full disk): the output is incomplete; do not use it.',
  'output.symlink': "The output path is a symbolic link, and speedband never writes through one: give the real file's path or remove the link.",
  'output.unwritable': 'Writing an output failed (full disk, permissions) and nothing was replaced: free space, fix permissions or choose another path.',

  // Demo
  'demo.unknownVehicle': 'No bundled demo vehicle of that name: choose one of those listed.',

  // Command line
  'cli.badCoefficients': 'A coefficient list option is not a list of numbers: give them highest power first, e.g. --denominator "1 3 2".',
  'cli.badList': 'A list option is not comma-separated numbers or a start:step:end range, or lists too many values: fix the list.',
  'cli.badNumber': 'A numeric option is not a number in its range: give a finite number as --help states.',
  'cli.conflictingOptions': 'Two options that give the same thing (e.g. --logs and --models) were both given: use one.',
  'cli.conflictingPlant': 'Both a transfer function and a first-order-plus-dead-time plant were given: pass one plant.',
  'cli.incompleteModel': 'Only part of a model was given (e.g. --gain without --dead-time-s): give all its options.',
  'cli.invalidOption': 'An option value is outside what the command takes (e.g. --grid-speeds): give a value as --help states.',
  'cli.missingInput': 'The command has no input to work on: give --logs or --models.',
  'cli.missingModel': 'No plant or vehicle model was given: pass one of the model options --help lists.',
  'cli.missingOption': 'The options given ask the command to do nothing: add the output option the message names.',
  'cli.missingVehicle': '--models needs --vehicle, the vehicle file the models were identified with: pass it.',
  'cli.optionConflict': 'Two output options that exclude each other were given (--json and --markdown): choose one.',
  'cli.optionNotApplicable': 'An option does not apply with the others given (e.g. --q-format without --format c): drop it or change the others.',
  'cli.optionNotTaken': 'A rule-parameter option was given that the chosen tuning rule does not take: drop it or choose another rule.',
  'cli.usage': 'The command line does not parse (unknown command or option, missing value): read --help.',

  // A bug
  internal: 'A bug in speedband, not a problem of the input: report it with the command you ran.',
} as const satisfies Record<string, string>;

/** A code of `ERROR_CODES`: the only codes a `SpeedbandError` takes. */
export type ErrorCode = keyof typeof ERROR_CODES;

/** True when `value` is one of the codes above. */
export function isErrorCode(value: unknown): value is ErrorCode {
  return typeof value === 'string' && Object.hasOwn(ERROR_CODES, value);
}

/**
 * The exit code of the CLI for an error of this code: 3 for `internal` (a bug in speedband),
 * 2 for every other code (bad input or usage: nothing was computed).
 */
export function exitCodeForError(code: ErrorCode): 2 | 3 {
  return code === 'internal' ? 3 : 2;
}
