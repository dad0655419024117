// Flue types and their labels, without zod, so screens that only show a label (the field visit
// overview) do not load the schema library with their first paint. The schemas import them from here.
export const FLUE_TYPES = ['open_flue', 'room_sealed', 'balanced', 'fan_assisted', 'flueless'] as const;
export type FlueType = (typeof FLUE_TYPES)[number];
export const FLUE_TYPE_LABELS: Record<FlueType, string> = {
  open_flue: 'Open flue',
  room_sealed: 'Room-sealed',
  balanced: 'Balanced flue',
  fan_assisted: 'Fan-assisted flue',
  flueless: 'Flueless',
};
