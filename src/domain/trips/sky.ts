// Sky choices on their own (no schema library), for pages that only show them.

/** Friendly sky choices mapped to cloud cover in oktas (WMO: 0 clear … 8 overcast). */
export const SKY_CHOICES = [
  { label: 'Clear', oktas: 0 },
  { label: 'Mostly sunny', oktas: 2 },
  { label: 'Partly cloudy', oktas: 4 },
  { label: 'Mostly cloudy', oktas: 6 },
  { label: 'Overcast', oktas: 8 },
] as const;
