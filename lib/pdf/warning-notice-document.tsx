import 'server-only';
// The one-page notice left with the occupant for each danger finding: what was found, what the
// engineer did, what they must not do, and whom to call. Written for someone who is not an
// engineer, in plain words; printed on site from the field app or sent with the certificate.
import { Circle, Document, Page, Path, StyleSheet, Svg, Text, View, renderToBuffer } from '@react-pdf/renderer';
import { CAUTION_LINES, HIGH_ROOM_CO_ADVICE } from '@/components/safety/caution';
import { PDF_FONT, registerPdfFonts } from './fonts';
import { PdfGlyph } from './page-header';
import { PDF_COLOURS, PDF_PAGE } from './theme';

export type WarningNoticeInput = {
  organisation: { name: string; phone: string | null; email: string | null };
  site: { addressLine1: string; addressLine2: string | null; town: string; postcode: string; reference: string };
  engineer: { name: string; registrationNumber: string | null };
  visitDate: string;
  finding: { id: string; description: string; applianceLabel: string | null; actionLabel: string };
  madeSafe: { madeSafeByLabel: string; consent: 'given' | 'refused'; refusalNote: string | null } | null;
  /** Set when the notice is produced with an issued certificate. */
  certificateNumberText: string | null;
};

export const MUST_NOT_LINES = [
  'Do not turn the appliance back on, or let anyone else do so, until a qualified engineer has put it right and tested it.',
  'Do not remove this notice, any label, or any cap or seal the engineer fitted.',
  'Do not block vents, air bricks or the flue, and do not cover the appliance.',
  'Do not sleep in a room where the appliance is, if it has been used since this notice was left.',
] as const;

const s = StyleSheet.create({
  page: { fontFamily: PDF_FONT, fontSize: 10.5, color: PDF_COLOURS.ink, padding: PDF_PAGE.margin },
  top: { flexDirection: 'row', alignItems: 'center', marginBottom: 12 },
  org: { marginLeft: 8, flexGrow: 1 },
  banner: { flexDirection: 'row', alignItems: 'center', backgroundColor: PDF_COLOURS.danger, color: '#ffffff', padding: 12, borderRadius: 4, marginBottom: 14 },
  bannerText: { flexGrow: 1, flexBasis: 0, marginLeft: 12 },
  bannerTitle: { fontSize: 22, fontWeight: 700 },
  bannerSub: { fontSize: 12, marginTop: 3 },
  section: { marginBottom: 11 },
  h: { fontSize: 9, fontWeight: 700, color: PDF_COLOURS.danger, textTransform: 'uppercase', letterSpacing: 0.8, marginBottom: 3 },
  strong: { fontWeight: 700 },
  soft: { color: PDF_COLOURS.inkSoft, fontSize: 9 },
  bullet: { flexDirection: 'row', marginTop: 2 },
  call: { borderWidth: 1.5, borderColor: PDF_COLOURS.danger, borderRadius: 4, padding: 8, marginBottom: 11 },
  caution: { fontSize: 8, color: PDF_COLOURS.inkSoft, borderTopWidth: 0.5, borderColor: PDF_COLOURS.line, paddingTop: 6, marginTop: 'auto' },
});

function formatDate(iso: string): string {
  const [y, m, d] = iso.slice(0, 10).split('-').map(Number);
  return new Date(Date.UTC(y!, m! - 1, d!)).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
}

function Bullets({ lines }: { lines: readonly string[] }) {
  return (
    <View>
      {lines.map((line) => (
        <View key={line} style={s.bullet}>
          <Text style={{ width: 10 }}>•</Text>
          <Text style={{ flexGrow: 1, flexBasis: 0 }}>{line}</Text>
        </View>
      ))}
    </View>
  );
}

export function WarningNoticeDocument({ notice: n }: { notice: WarningNoticeInput }) {
  const address = [n.site.addressLine1, n.site.addressLine2, n.site.town, n.site.postcode].filter(Boolean).join(', ');
  return (
    <Document title="Warning notice: dangerous appliance" author={n.organisation.name} creator="Hearthmark">
      <Page size={PDF_PAGE.size} style={s.page}>
        <View style={s.top}>
          <PdfGlyph size={28} />
          <View style={s.org}>
            <Text style={s.strong}>{n.organisation.name}</Text>
            <Text style={s.soft}>
              Notice left at {address} on {formatDate(n.visitDate)}
            </Text>
          </View>
        </View>

        <View style={s.banner}>
          {/* The danger octagon of the verdict marks, so a black-and-white copy still reads as a stop sign. */}
          <Svg width={40} height={40} viewBox="0 0 20 20">
            <Path d="M6 1h8l5 5v8l-5 5H6l-5-5V6z" fill="#ffffff" />
            <Path d="M10 5v6" stroke={PDF_COLOURS.danger} strokeWidth={2.6} />
            <Circle cx={10} cy={14.6} r={1.5} fill={PDF_COLOURS.danger} />
          </Svg>
          <View style={s.bannerText}>
            <Text style={s.bannerTitle}>DANGER: DO NOT USE</Text>
            <Text style={s.bannerSub}>{n.finding.applianceLabel ? `${n.finding.applianceLabel} is not safe to use.` : 'Part of the gas or oil installation here is not safe to use.'}</Text>
          </View>
        </View>

        <View style={s.section}>
          <Text style={s.h}>What the engineer found</Text>
          <Text>{n.finding.description}</Text>
        </View>

        <View style={s.section}>
          <Text style={s.h}>What the engineer did</Text>
          <Text>{n.finding.actionLabel}.</Text>
          {n.madeSafe ? (
            <Text>
              {/* The action and the make-safe step are often the same words; say them once. */}
              {n.madeSafe.madeSafeByLabel === n.finding.actionLabel ? '' : `${n.madeSafe.madeSafeByLabel}. `}
              You {n.madeSafe.consent === 'given' ? 'agreed to this' : 'did not agree to this'}
              {n.madeSafe.refusalNote ? ` (${n.madeSafe.refusalNote})` : ''}.
            </Text>
          ) : null}
        </View>

        <View style={s.section}>
          <Text style={s.h}>What you must not do</Text>
          <Bullets lines={MUST_NOT_LINES} />
        </View>

        <View style={s.call}>
          <Text style={s.h}>Whom to call</Text>
          <Text>
            To arrange the repair: <Text style={s.strong}>{n.organisation.name}</Text>
            {n.organisation.phone ? `, ${n.organisation.phone}` : ''}
            {n.organisation.email ? `, ${n.organisation.email}` : ''}, or another qualified engineer.
          </Text>
          <Text>If you smell gas or fumes: the gas emergency line for your area, at any hour.</Text>
          <Text>If anyone feels unwell: the emergency services.</Text>
        </View>

        <View style={s.section}>
          <Text style={s.h}>If a CO alarm sounds or you feel unwell</Text>
          <Bullets lines={HIGH_ROOM_CO_ADVICE} />
        </View>

        <View style={s.caution}>
          <Text>
            Engineer: {n.engineer.name}
            {n.engineer.registrationNumber ? `, registration no. ${n.engineer.registrationNumber}` : ''}. Property ref. {n.site.reference}.
            {n.certificateNumberText ? ` Recorded on certificate ${n.certificateNumberText}.` : ''} Finding ref. {n.finding.id.slice(0, 8)}.
          </Text>
          {CAUTION_LINES.map((line) => (
            <Text key={line}>{line}</Text>
          ))}
        </View>
      </Page>
    </Document>
  );
}

export async function renderWarningNoticePdf(notice: WarningNoticeInput): Promise<Buffer> {
  registerPdfFonts();
  return renderToBuffer(<WarningNoticeDocument notice={notice} />);
}
