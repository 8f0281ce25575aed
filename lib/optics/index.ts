export { fresnelReflectance, fresnelRs, fresnelRp, normalIncidenceReflectance, type PolarisedReflectance } from './fresnel';
export { brewsterAngle } from './brewster-angle';
export { criticalAngle } from './critical-angle';
export { plateSums, uncoatedPlate, type PlateSums, type PolarisedPlate } from './plate-sums';
export { ghostToPrimary, plateGhost, type GhostRatio, type PlateGhostInput } from './plate-ghost';
export { malus } from './malus';
export {
  polariserSingleTransmittance,
  polariserDegreeOfPolarisation,
  polariserExtinctionRatio,
  polariserPolarisedTransmittance,
} from './polariser';
export {
  unpolarisedLight,
  linearLight,
  degreeOfLinearPolarisation,
  polarisationAngle,
  throughPolariser,
  throughChain,
  chainTransmittance,
  type LightState,
  type ChainElement,
} from './light';
export { detectLayout, reflectionCount, type StackLayout } from './layout';
export { handednessFromReflections, type Handedness } from './handedness';
export { birdbathDisplayEfficiency, birdbathSeeThrough, stackBudget, type StackBudget } from './budget';
export {
  predictedContrastRatio,
  requiredDisplayAtEye,
  logGrid,
  contrastCurve,
  type ContrastPoint,
  type ContrastCurveOptions,
} from './contrast';
export { predictStack, type StackPrediction } from './predict';
export {
  STACK_TEMPLATE_IDS,
  listStackTemplates,
  getStackTemplate,
  type StackTemplate,
  type StackTemplateId,
} from './templates';
export { stackSchema, stackElementSchema } from '../schemas/stack';
export type { Stack, StackElement, StackElementKind } from '../schemas/stack';
