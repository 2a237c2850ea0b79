/**
 * Kinetwin's closed-form engine: Laplace-domain responses of the joint with theorem guards,
 * step metrics and a fast evaluator. Pure TypeScript; no I/O.
 */
export { solveClosedForm } from './solve-closed-form';
export { DEFAULT_CLOSED_FORM_OPTIONS, type ClosedFormOptions } from './closed-form-options';
export type { ClosedFormSolution, PoleSummary, Stability } from './closed-form-solution';
export { evaluateClosedForm, gridPointCount, MAX_GRID_POINTS, type SampledResponse } from './evaluate-closed-form';
export { evaluateUniformGrid, responseAt, compileResponsePlan, type ResponsePlan } from './response-evaluator';
export { invertScenario, type InvertedResponse } from './inverse-response';
export type { ResponseTerm } from './response-terms';
export type { TermSource } from './input-transforms';
export type { FinalValue, InitialValue } from './value-theorems';
export { inverseLaplace, evaluateInverseLaplace, type InverseLaplace } from './inverse-laplace';
export type { RationalFunction } from './rational-function';
export type { ChannelTransferFunctions } from './joint-transfer';
export { SETTLING_BANDS, DEFAULT_SETTLING_BAND, type StepMetrics, type SettlingBand } from './step-metrics';
export type { DominantPair } from './second-order-estimates';
