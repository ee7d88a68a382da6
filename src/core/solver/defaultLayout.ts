/**
 * Default placement for masks the plan gives no position: the naive cross along the galaxy's axes
 * (one implementation, kept with the pointing search that starts from it; see solver/pointingSearch.ts).
 */
export { naiveCrossLayout as defaultMaskLayout } from './pointingSearch';
