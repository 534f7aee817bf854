export { analyze } from './analyze';
export { Evaluator, DEFAULT_RULES, PROVISIONAL_BELOW, type AppendResult, type EvaluatorConfig } from './evaluator';
export { EngineInputError } from './subgroup-stats';
export { chartConstants, c4, MEDIAN_MR_FACTOR, type ChartConstants } from './constants';
export { normalCdf, normalPdf, normalQuantile } from './normal';
export { chiSquareCdf, chiSquareQuantile } from './gamma';
export type * from './types';
