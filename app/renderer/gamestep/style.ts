/**
 * Colours of the game-step check, shared by its Timeline lanes, the System view and the
 * panel's legend (one hue means the game's flight everywhere): rose for the game's path and
 * its errors, chalk for the reference flight it is compared with, amber-yellow (the app's warn)
 * for the tolerance.
 */
export const GAME_STYLE = {
  game: '#f28cb5',
  reference: '#dfe6e1',
  tolerance: '#e9b949',
  resolution: '#8c9b95',
  exceed: '#f06b5b',
  /** Dash pattern of extrapolated stretches, px. */
  dash: '5 4',
  /** Opacity of stretches measured after an extrapolated region. */
  carriedOpacity: 0.5,
} as const;
