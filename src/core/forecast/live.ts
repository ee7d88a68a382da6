/**
 * The editor's live forecast: the same forecast with fewer trials while a mask is dragged (errors good to about
 * 1/sqrt(2(N - 1)), 16 % for 20 trials, stated in the panel), and the full default once the layout settles.
 */
import { trialPrecision } from './forecast';

/** Trials of the live forecast during a drag. */
export const LIVE_FORECAST_TRIALS = 20;

/** Relative precision of the live forecast's quoted errors. */
export const LIVE_FORECAST_PRECISION = trialPrecision(LIVE_FORECAST_TRIALS);
