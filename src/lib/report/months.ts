/** Month names for tables and charts (English, fixed: pages do not depend on the build machine's locale). */

export const MONTH_NAMES = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'] as const;
export const MONTH_SHORT = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'] as const;

/** Name of a table period: `01` → January, `year` → Whole year. */
export function periodName(period: string): string {
  if (period === 'year') return 'Whole year';
  return MONTH_NAMES[Number(period) - 1] ?? period;
}

/** A local clock hour as `07:00` [h, 0–24]. */
export function clockHour(h: number): string {
  return `${String(h).padStart(2, '0')}:00`;
}
