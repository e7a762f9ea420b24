/**
 * The query layer's public surface: parse targets and filters, evaluate them on a stored sweep. See
 * evaluate.ts for the entry point and its TSDoc.
 */
export { countTargets, evaluateTargets, type EvaluateRequest, type Evaluation, type TargetCounts, type VariedParameter, type ParameterScale } from './evaluate.js';
export { parseTarget, targetHelpLines, TARGETS, type TargetInvocation, type TargetDescriptor, type TargetArg, type TargetArgs } from './targets.js';
export { parseFilter, MAX_FILTER_CHARS, MAX_FILTER_DEPTH, type Expr } from './parser.js';
export { filterNameLines, BARE_NAMES, CHECKPOINT_NAMES, type FilterName } from './names.js';
export type { SweepSpace } from './sweep-space.js';
export { parameterLabel } from './sweep-space.js';
