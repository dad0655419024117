// The top band of every Hearthmark PDF: the name mark, the issuing organisation, and the document
// title with its reference on the right.
import { Path, Rect, StyleSheet, Svg, Text, View } from '@react-pdf/renderer';
import { PDF_FONT } from './fonts';
import { PDF_COLOURS } from './theme';

const styles = StyleSheet.create({
  band: { flexDirection: 'row', alignItems: 'center', borderBottomWidth: 2, borderBottomColor: PDF_COLOURS.copper, paddingBottom: 10, marginBottom: 16 },
  mark: { flexDirection: 'row', alignItems: 'center', flexGrow: 1 },
  markWord: { fontFamily: PDF_FONT, fontWeight: 700, fontSize: 14, color: PDF_COLOURS.ink, marginLeft: 6 },
  organisation: { fontFamily: PDF_FONT, fontSize: 9, color: PDF_COLOURS.inkSoft, marginLeft: 6 },
  titleBlock: { alignItems: 'flex-end' },
  title: { fontFamily: PDF_FONT, fontWeight: 700, fontSize: 18, color: PDF_COLOURS.ink },
  reference: { fontFamily: PDF_FONT, fontWeight: 600, fontSize: 10, color: PDF_COLOURS.inkSoft, marginTop: 2 },
});

/** The hearth glyph drawn in PDF vector paths (same shapes as components/brand/hearth-mark.tsx). */
export function PdfGlyph({ size = 26 }: { size?: number }) {
  return (
    <Svg width={size} height={size} viewBox="0 0 64 64">
      <Rect x={2} y={2} width={60} height={60} rx={14} ry={14} fill={PDF_COLOURS.copper} />
      <Path d="M14 52V30a18 18 0 0 1 36 0v22" fill="none" stroke={PDF_COLOURS.paper} strokeWidth={5} strokeLinecap="round" />
      <Path d="M32 50c-6 0-9-4-9-8.5 0-5 4-7.5 5.5-12 2.5 3 3 5.5 2.5 8 2-1 3.5-3 4-5.5 3 3 6 6 6 9.5 0 4.5-3 8.5-9 8.5z" fill={PDF_COLOURS.paper} />
      <Path d="M10 54h44" stroke={PDF_COLOURS.paper} strokeWidth={4} strokeLinecap="round" />
    </Svg>
  );
}

export function PdfPageHeader({ organisation, title, reference }: { organisation: string; title: string; reference: string }) {
  return (
    <View style={styles.band} fixed>
      <View style={styles.mark}>
        <PdfGlyph />
        <View>
          <Text style={styles.markWord}>Hearthmark</Text>
          <Text style={styles.organisation}>{organisation}</Text>
        </View>
      </View>
      <View style={styles.titleBlock}>
        <Text style={styles.title}>{title}</Text>
        <Text style={styles.reference}>{reference}</Text>
      </View>
    </View>
  );
}
