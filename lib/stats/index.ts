export { mean } from './mean';
export { variance, standardDeviation } from './standard-deviation';
export { studentTQuantile, studentTCdf, twoSidedPValue } from './t-distribution';
export {
  summarise,
  summaryFromMoments,
  meanConfidenceInterval,
  toMoments,
  type Moments,
  type GroupSummary,
  type GroupInput,
  type Interval,
} from './summary';
export { welchTest, welchDegreesOfFreedom, pooledTest, type TwoSampleResult } from './two-sample';
export {
  compareVerdict,
  formatPValue,
  levelFromP,
  type Verdict,
  type VerdictInput,
  type VerdictLevel,
} from './verdict';
