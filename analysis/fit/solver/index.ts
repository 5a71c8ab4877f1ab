export { levenbergMarquardt, type SolverOptions, type SolverProblem, type SolverResult, type StopReason } from './levenbergMarquardt';
export { huberFit, huberWeights, madScale, HUBER_K, type RobustResult } from './huber';
export { choleskyScaled, choleskySolve, normalEquations, solveScaled, type ColumnTails } from './normalEquations';
