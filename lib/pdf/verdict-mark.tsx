// A verdict in a PDF, never by colour alone: each level has its own shape and word (the same
// shapes as components/ui/verdict-badge.tsx), so a black-and-white print still reads right.
import { Circle, Path, StyleSheet, Svg, Text, View } from '@react-pdf/renderer';
import type { VerdictLevel } from '@/lib/limits';
import { PDF_FONT } from './fonts';
import { PDF_COLOURS } from './theme';

export const PDF_VERDICT_WORDS: Record<VerdictLevel, string> = {
  clear: 'Clear',
  service: 'Service advised',
  danger: 'Danger',
  unknown: 'Not judged',
};

const TONE: Record<VerdictLevel, { fg: string; bg: string }> = {
  clear: { fg: PDF_COLOURS.clear, bg: PDF_COLOURS.clearSoft },
  service: { fg: PDF_COLOURS.service, bg: PDF_COLOURS.serviceSoft },
  danger: { fg: PDF_COLOURS.danger, bg: PDF_COLOURS.dangerSoft },
  unknown: { fg: PDF_COLOURS.inkSoft, bg: PDF_COLOURS.paper },
};

const s = StyleSheet.create({
  mark: { flexDirection: 'row', alignItems: 'center', alignSelf: 'flex-start', borderWidth: 1, borderRadius: 3, paddingVertical: 2, paddingHorizontal: 5 },
  word: { fontFamily: PDF_FONT, fontWeight: 700, marginLeft: 4, textTransform: 'uppercase', letterSpacing: 0.4 },
});

function Shape({ level, size }: { level: VerdictLevel; size: number }) {
  const fg = TONE[level].fg;
  return (
    <Svg width={size} height={size} viewBox="0 0 20 20">
      {level === 'clear' ? (
        <>
          <Circle cx={10} cy={10} r={9} fill={fg} />
          <Path d="M5.5 10.5l3 3 6-7" stroke="#ffffff" strokeWidth={2.2} fill="none" />
        </>
      ) : level === 'service' ? (
        <>
          <Path d="M10 1l9 9-9 9-9-9z" fill={fg} />
          <Path d="M6 10h8" stroke="#ffffff" strokeWidth={2.4} />
        </>
      ) : level === 'danger' ? (
        <>
          <Path d="M6 1h8l5 5v8l-5 5H6l-5-5V6z" fill={fg} />
          <Path d="M10 5v6" stroke="#ffffff" strokeWidth={2.6} />
          <Circle cx={10} cy={14.6} r={1.5} fill="#ffffff" />
        </>
      ) : (
        <Circle cx={10} cy={10} r={8.5} fill="none" stroke={fg} strokeWidth={1.8} strokeDasharray="3 2" />
      )}
    </Svg>
  );
}

export function PdfVerdictMark({ level, size = 9, label }: { level: VerdictLevel; size?: number; label?: string }) {
  const tone = TONE[level];
  return (
    <View style={[s.mark, { borderColor: tone.fg, backgroundColor: tone.bg }]}>
      <Shape level={level} size={size + 2} />
      <Text style={[s.word, { color: tone.fg, fontSize: size }]}>{label ?? PDF_VERDICT_WORDS[level]}</Text>
    </View>
  );
}
