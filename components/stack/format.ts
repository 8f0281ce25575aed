// The planner's number formats come from the one formatting module (lib/format).
export { formatLuminance, formatLuminanceTick, formatPercent, formatRatio } from '@/lib/format';
