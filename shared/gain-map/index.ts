/**
 * The gain map: two controller gains swept over a grid, each cell evaluated by the closed form or
 * the twin, judged against the scenario's limits. Pure; plans and results are plain data.
 * Plan (planGainMap), evaluate chunks of cells (evaluateCells), gather (summarizeGainMap).
 */
export { AXIS_SPACINGS, MAP_GAINS, MAX_AXIS_POINTS, MIN_AXIS_POINTS, axisValues, type AxisSpacing, type FixedGain, type GainAxis } from './gain-axes';
export { gainMapRequestSchema, type AxisRequest, type GainMapRequest } from './gain-map-request';
export { cellGains, cellPosition, chunkCells, planErrors, planGainMap, scenarioAtCell, type GainMapPlan } from './gain-map-plan';
export { GAIN_MAP_METHODS, MAP_METRICS, MAP_METRIC_UNITS, metricsOf, type CellMetrics, type CellResult, type GainMapMethod, type MapMetric } from './cell-metrics';
export { evaluateCells, methodErrors } from './evaluate-cells';
export { cellVerdict, hasLimits, type CellVerdict } from './cell-margin';
export { summarizeGainMap, type GainMapResult, type LimitContour, type MapMatrix, type SuggestedCell } from './gain-map-result';
export { SETTLED_TAIL_FRACTION } from './trace-step-metrics';
