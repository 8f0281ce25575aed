export { PATTERN_MIN_SIZE, PATTERN_MAX_SIZE, type RgbImage } from './types';
export { assertPatternSize } from './image';
export { whitePattern, blackPattern } from './solid';
export { checkerboardPattern, checkerboardCell } from './checkerboard';
export { GREY_STEPS, GREY_STEP_LINEAR, greyStepAt, greyStepsPattern, type GreyStep } from './grey-steps';
export { uniformityPattern, uniformityPoint, UNIFORMITY_MARK_LEVEL } from './uniformity';
export { orientationPattern, orientationLayout, type OrientationLayout } from './orientation';
export { PATTERN_PRESETS, type PatternPreset } from './presets';
export { PATTERN_KINDS, isPatternKind, renderPattern, type PatternKind } from './render-pattern';
