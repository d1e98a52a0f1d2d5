// decide: public exports of this module (re-exports only; src/internals.ts re-exports this file).
export { summariseScorecard, type SettingSummary } from './summarise-scorecard.js';
export { meanInterval, proportionInterval, type MeanInterval, type ProportionInterval } from './confidence.js';
export { recommendSetting, metricWords, STANDING_CAVEATS, type Recommendation, type RecommendOptions, type PlantChoice, type SettingEvidence } from './recommend-setting.js';
export { parameterTradeoff, type TradeoffEntry, type TradeoffGroup, type TradeoffOptions } from './parameter-tradeoff.js';
export { theoryBesideSimulation, type TheoryBesideSimulation, type TheoryRow } from './theory-beside-simulation.js';
export { metricBounds, EDGE_FRACTION, type MetricBounds } from './metric-bounds.js';
export { curvePeak } from './curve-peak.js';
export { studyOptima, type StudyOptima, type StudyOptimaOptions, type StudyLevelOptimum, type OptimumEstimate } from './study-optima.js';
