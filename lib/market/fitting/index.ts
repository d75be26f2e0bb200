// A buyer's own use of presets: fitting a bought one to their surface, trying one before buying.
export { startFit, getFit, acceptFit, readySurfaceOf } from './fit';
export { startTrial, getTrial, TRIALS_PER_BUYER, TRIAL_WINDOW_MINUTES, TOO_MANY_TRIALS } from './trial';
export { runPresetTransfer, failPresetTransfer, sweepOldTrials, TRIAL_KEEP_DAYS } from './transfers';
export { trialLimits, TRIAL_GUIDE_SHARE, TRIAL_POINTS_PER_GUIDE } from './trial-limits';
