// Colours and sizes shared by every Hearthmark PDF; the same tokens as app/globals.css.
export const PDF_COLOURS = {
  ink: '#1b2030',
  inkSoft: '#4a5163',
  paper: '#f7f5f0',
  line: '#dcd7cc',
  copper: '#a8471f',
  copperSoft: '#f6e7dd',
  clear: '#1c6e45',
  clearSoft: '#e3f3ea',
  service: '#8f5000',
  serviceSoft: '#fdf0d9',
  danger: '#a61b14',
  dangerSoft: '#fde6e3',
} as const;

/** A4 in points, with the margin every document uses. */
export const PDF_PAGE = { size: 'A4' as const, margin: 40 };
