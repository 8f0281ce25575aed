/** A common small-display resolution. */
export interface PatternPreset {
  id: string;
  label: string;
  width: number;
  height: number;
}

/** Resolutions often found on the small displays of see-through prototypes. */
export const PATTERN_PRESETS: readonly PatternPreset[] = Object.freeze([
  { id: '320x240', label: '320 × 240 (QVGA)', width: 320, height: 240 },
  { id: '640x400', label: '640 × 400', width: 640, height: 400 },
  { id: '640x480', label: '640 × 480 (VGA)', width: 640, height: 480 },
  { id: '800x480', label: '800 × 480 (WVGA)', width: 800, height: 480 },
  { id: '854x480', label: '854 × 480 (FWVGA)', width: 854, height: 480 },
  { id: '1024x600', label: '1024 × 600 (WSVGA)', width: 1024, height: 600 },
  { id: '1280x720', label: '1280 × 720 (HD)', width: 1280, height: 720 },
  { id: '1280x800', label: '1280 × 800 (WXGA)', width: 1280, height: 800 },
  { id: '1920x1080', label: '1920 × 1080 (Full HD)', width: 1920, height: 1080 },
  { id: '1920x1200', label: '1920 × 1200 (WUXGA)', width: 1920, height: 1200 },
]);
