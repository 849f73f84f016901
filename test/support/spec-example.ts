// The example plan of the language specification, section 9 (an invented
// practice table), line for line, shared by the tests that check it.
export const SPEC_EXAMPLE_LINES: readonly string[] = [
  'plan "Parcel table, practice run A"',
  'units mm',
  'wheel 62 mm',
  'track 128 mm effective 130 mm',
  'body 150 by 190 axle -30',
  'field 2000 by 1200 grid 100',
  'box "shelf" (900, 500) to (1100, 800)',
  'zone "dock" (1700, 900) to (1950, 1150)',
  'limit 150 s',
  '',
  'let lane = 250 mm',
  '',
  'run "to the dock"',
  'start (200, 200) heading 0',
  'drive 3 * lane speed 60% hold 0',
  'turn 90 by gyro min 12% gain 1.2',
  'drive 1450 hold 90 ramp 800 mm/s^2',
  'turn -90 pivot left',
  'mark "parked" in "dock"',
];

export const SPEC_EXAMPLE = SPEC_EXAMPLE_LINES.join('\n');
