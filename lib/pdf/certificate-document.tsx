import 'server-only';
// The certificate as a PDF, drawn only from the frozen content (lib/certificates/types.ts): the
// outcome and dates with the check QR code first, then who and where, each appliance with its
// readings and the rule that decided it, the installation checks, findings, sign-off, and the
// safety wording. A void copy carries a VOID band on every page; the stored original is unchanged.
import { Document, Image, Page, StyleSheet, Text, View, renderToBuffer } from '@react-pdf/renderer';
import QRCode from 'qrcode';
import { TEST_POINT_LABELS } from '@/lib/limits';
import { fmt } from '@/lib/certificates/snapshot';
import type { CertificateAppliance, CertificateContent } from '@/lib/certificates/types';
import { PDF_FONT, registerPdfFonts } from './fonts';
import { PdfPageHeader } from './page-header';
import { PDF_COLOURS, PDF_PAGE } from './theme';
import { PdfVerdictMark, PDF_VERDICT_WORDS } from './verdict-mark';

export type VoidMarking = { voidedAt: string; reason: string; replacedByNumberText: string | null };

const s = StyleSheet.create({
  page: { fontFamily: PDF_FONT, fontSize: 9, color: PDF_COLOURS.ink, padding: PDF_PAGE.margin, paddingBottom: 56 },
  voidBand: { backgroundColor: PDF_COLOURS.danger, color: '#ffffff', padding: 6, marginBottom: 10, borderRadius: 3 },
  voidTitle: { fontSize: 16, fontWeight: 700 },
  outcome: { flexDirection: 'row', borderWidth: 1, borderColor: PDF_COLOURS.line, borderRadius: 4, padding: 10, marginBottom: 12 },
  outcomeMain: { flexGrow: 1, flexBasis: 0, paddingRight: 10 },
  bigLabel: { fontSize: 8, fontWeight: 700, color: PDF_COLOURS.inkSoft, textTransform: 'uppercase', letterSpacing: 0.6, marginBottom: 3 },
  outcomeLine: { marginTop: 4, fontSize: 9.5 },
  dates: { flexDirection: 'row', marginTop: 8 },
  date: { marginRight: 24 },
  dateValue: { fontSize: 12, fontWeight: 700 },
  qrBox: { width: 104, alignItems: 'center' },
  qr: { width: 92, height: 92 },
  qrText: { fontSize: 6.5, color: PDF_COLOURS.inkSoft, textAlign: 'center', marginTop: 2 },
  columns: { flexDirection: 'row', marginBottom: 12 },
  column: { flexGrow: 1, flexBasis: 0, paddingRight: 10 },
  strong: { fontWeight: 700 },
  soft: { color: PDF_COLOURS.inkSoft },
  h2: { fontSize: 11, fontWeight: 700, marginTop: 6, marginBottom: 5, color: PDF_COLOURS.copper },
  card: { borderLeftWidth: 3, borderLeftColor: PDF_COLOURS.line, paddingLeft: 8, marginBottom: 10 },
  cardHead: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', marginBottom: 3 },
  cardTitle: { fontSize: 10, fontWeight: 700, flexGrow: 1, flexBasis: 0, paddingRight: 6 },
  th: { flexDirection: 'row', borderBottomWidth: 1, borderColor: PDF_COLOURS.ink, paddingBottom: 2, marginTop: 4, fontWeight: 700, fontSize: 7.5 },
  tr: { flexDirection: 'row', borderBottomWidth: 0.5, borderColor: PDF_COLOURS.line, paddingVertical: 2.5 },
  cPoint: { width: 62 },
  cNum: { flexGrow: 1, flexBasis: 0, textAlign: 'right' },
  decided: { marginTop: 4, padding: 5, backgroundColor: PDF_COLOURS.paper, borderRadius: 3 },
  warnLine: { fontSize: 7.5, color: PDF_COLOURS.service, marginTop: 2 },
  itemLine: { fontSize: 7.5, color: PDF_COLOURS.inkSoft, marginTop: 1.5 },
  cName: { flexGrow: 2, flexBasis: 0, paddingRight: 6 },
  cWide: { flexGrow: 3, flexBasis: 0, paddingRight: 6 },
  cLevel: { width: 92 },
  caution: { marginTop: 10, padding: 8, borderWidth: 1, borderColor: PDF_COLOURS.copper, borderRadius: 4, backgroundColor: PDF_COLOURS.copperSoft },
  bullet: { flexDirection: 'row', marginTop: 1.5 },
  footer: { position: 'absolute', left: PDF_PAGE.margin, right: PDF_PAGE.margin, bottom: 22, fontSize: 7, color: PDF_COLOURS.inkSoft, borderTopWidth: 0.5, borderColor: PDF_COLOURS.line, paddingTop: 5, flexDirection: 'row', justifyContent: 'space-between' },
});

function formatDate(iso: string): string {
  const [y, m, d] = iso.slice(0, 10).split('-').map(Number);
  return new Date(Date.UTC(y!, m! - 1, d!)).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
}

/** What the overall mark means, in words a landlord or tenant reads without an engineer beside them. */
const OUTCOME_LINES: Record<CertificateContent['overall'], string> = {
  clear: 'Every appliance tested was within its limits.',
  service: 'Service or repair is advised; the appliances and findings below say what.',
  danger: 'Something was found dangerous and made safe. Do not use it until it has been repaired; see the findings below.',
  unknown: 'Some figures could not be judged against a limit; the appliances below say which.',
};

function cap(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

function Bullets({ lines }: { lines: readonly string[] }) {
  return (
    <View>
      {lines.map((line) => (
        <View key={line} style={s.bullet}>
          <Text style={{ width: 8 }}>•</Text>
          <Text style={{ flexGrow: 1, flexBasis: 0 }}>{line}</Text>
        </View>
      ))}
    </View>
  );
}

function ApplianceBlock({ a }: { a: CertificateAppliance }) {
  const flagged = a.items.filter((i) => i.level !== 'clear');
  return (
    <View style={s.card} wrap={false}>
      <View style={s.cardHead}>
        <Text style={s.cardTitle}>{a.label}</Text>
        <PdfVerdictMark level={a.tested ? a.level : 'unknown'} label={a.tested ? undefined : 'Not tested'} />
      </View>
      <Text style={s.soft}>
        {a.fuel} · {a.flueType}
        {a.serial ? ` · serial ${a.serial}` : ''}
        {a.heatInputGrossKw !== null ? ` · heat input ${fmt(a.heatInputGrossKw, 1)} kW gross` : ''}
        {a.operatingPressureMbar !== null ? ` · ${fmt(a.operatingPressureMbar, 1)} mbar` : ''}
        {a.spillage ? ` · spillage test ${a.spillage === 'na' ? 'not applicable' : a.spillage}` : ''}
      </Text>
      {a.analyser ? (
        <Text style={s.soft}>
          Analyser {a.analyser.make} {a.analyser.model}, serial {a.analyser.serial}, calibration due {formatDate(a.analyser.calibrationDue)}
        </Text>
      ) : null}
      {a.analyserOverrideReason ? <Text style={s.warnLine}>Analyser used past its calibration date. Engineer&apos;s reason: {a.analyserOverrideReason}</Text> : null}
      {!a.tested ? <Text style={{ marginTop: 2 }}>Not tested on this visit{a.notTestedReason ? `: ${a.notTestedReason}` : ''}.</Text> : null}
      {a.readings.length > 0 ? (
        <View>
          <View style={s.th}>
            <Text style={s.cPoint}>Test point</Text>
            <Text style={s.cNum}>CO ppm</Text>
            <Text style={s.cNum}>CO2 %</Text>
            <Text style={s.cNum}>O2 %</Text>
            <Text style={s.cNum}>CO/CO2 ratio</Text>
            <Text style={s.cNum}>Air-free CO ppm</Text>
            <Text style={s.cNum}>Flue °C</Text>
            <Text style={s.cNum}>Flue loss %</Text>
          </View>
          {a.readings.map((r) => (
            <View key={`${r.testPoint}-${r.takenAt}`} style={s.tr}>
              <Text style={s.cPoint}>{TEST_POINT_LABELS[r.testPoint]}</Text>
              <Text style={s.cNum}>{fmt(r.coPpm, 0)}</Text>
              <Text style={s.cNum}>{fmt(r.co2Pct, 1)}</Text>
              <Text style={s.cNum}>{fmt(r.o2Pct, 1)}</Text>
              <Text style={s.cNum}>{fmt(r.ratio, 4)}</Text>
              <Text style={s.cNum}>
                {fmt(r.coAirFreePpm, 0)}
                {r.airFreeRoute ? ` (${r.airFreeRoute === 'o2' ? 'by O2' : 'by CO2'})` : ''}
              </Text>
              <Text style={s.cNum}>{fmt(r.flueTempC, 0)}</Text>
              <Text style={s.cNum}>{fmt(r.flueLossPct, 1)}</Text>
            </View>
          ))}
          {a.readings.flatMap((r) => r.warnings.map((w) => <Text key={`${r.testPoint}-${w}`} style={s.warnLine}>{`${TEST_POINT_LABELS[r.testPoint]}: ${w}`}</Text>))}
        </View>
      ) : null}
      {a.tested ? (
        <View style={s.decided}>
          <Text>
            <Text style={s.strong}>Verdict: {PDF_VERDICT_WORDS[a.level]}. </Text>
            {a.decidedBy ? cap(a.decidedBy.explanation) : 'Every judged figure is within its limit.'}
          </Text>
          {a.decidedBy?.source ? <Text style={s.itemLine}>Source: {a.decidedBy.source}{a.decidedBy.jurisdictionName ? ` (${a.decidedBy.jurisdictionName})` : ''}</Text> : null}
          {(flagged.length > 0 ? flagged : a.items).slice(0, 8).filter((i) => i.explanation !== a.decidedBy?.explanation).map((i) => (
            <Text key={`${i.metric}-${i.testPoint}-${i.subject}`} style={s.itemLine}>
              {PDF_VERDICT_WORDS[i.level]}: {cap(i.explanation)}
            </Text>
          ))}
        </View>
      ) : null}
    </View>
  );
}

export function CertificateDocument({ content: c, qrDataUrl, voided }: { content: CertificateContent; qrDataUrl: string; voided?: VoidMarking | null }) {
  const org = c.organisation;
  const roomCoHigh = c.roomChecks.some((r) => r.level === 'service' || r.level === 'danger');
  return (
    <Document title={`Certificate ${c.numberText}`} author={org.name} subject="Appliance combustion safety certificate" creator="Hearthmark">
      <Page size={PDF_PAGE.size} style={s.page}>
        <PdfPageHeader organisation={org.name} title="Combustion safety certificate" reference={`No. ${c.numberText}`} />
        {voided ? (
          <View style={s.voidBand} fixed>
            <Text style={s.voidTitle}>VOID</Text>
            <Text>
              This certificate was voided on {formatDate(voided.voidedAt)} and must not be relied on. Reason: {voided.reason}
              {voided.replacedByNumberText ? ` It is replaced by certificate ${voided.replacedByNumberText}.` : ''}
            </Text>
          </View>
        ) : null}

        <View style={s.outcome}>
          <View style={s.outcomeMain}>
            <Text style={s.bigLabel}>Outcome of this visit</Text>
            <PdfVerdictMark level={c.overall} size={13} />
            <Text style={[s.outcomeLine, c.overall === 'danger' ? { color: PDF_COLOURS.danger, fontWeight: 700 } : {}]}>{OUTCOME_LINES[c.overall]}</Text>
            <View style={s.dates}>
              <View style={s.date}>
                <Text style={s.bigLabel}>Issued</Text>
                <Text style={s.dateValue}>{formatDate(c.issuedOn)}</Text>
              </View>
              <View style={s.date}>
                <Text style={s.bigLabel}>Valid until</Text>
                <Text style={s.dateValue}>{formatDate(c.expiresOn)}</Text>
              </View>
              <View style={s.date}>
                <Text style={s.bigLabel}>Checked on</Text>
                <Text style={s.dateValue}>{formatDate(c.visit.date)}</Text>
              </View>
            </View>
            {c.replacesNumberText ? <Text style={[s.soft, { marginTop: 6 }]}>This certificate corrects and replaces certificate {c.replacesNumberText}, which is void.</Text> : null}
          </View>
          <View style={s.qrBox}>
            {/* eslint-disable-next-line jsx-a11y/alt-text -- a react-pdf Image, not an HTML img; the caption below says what it is */}
            <Image src={qrDataUrl} style={s.qr} />
            <Text style={s.qrText}>Scan to check that this certificate is genuine and still valid.</Text>
          </View>
        </View>

        <View style={s.columns}>
          <View style={s.column}>
            <Text style={s.bigLabel}>Property</Text>
            <Text style={s.strong}>{[c.site.addressLine1, c.site.addressLine2].filter(Boolean).join(', ')}</Text>
            <Text>
              {c.site.town} {c.site.postcode}
            </Text>
            <Text style={s.soft}>
              Ref. {c.site.reference} · {c.site.jurisdictionName}
            </Text>
          </View>
          <View style={s.column}>
            <Text style={s.bigLabel}>Inspected by</Text>
            <Text style={s.strong}>{c.engineer.name}</Text>
            <Text>Engineer registration no. {c.engineer.registrationNumber ?? 'not recorded'}</Text>
            <Text style={s.soft}>for {org.name}{org.registrationNumber ? `, reg. ${org.registrationNumber}` : ''}</Text>
          </View>
          <View style={s.column}>
            <Text style={s.bigLabel}>Contact</Text>
            {org.address ? <Text>{org.address}</Text> : null}
            {org.phone ? <Text>{org.phone}</Text> : null}
            {org.email ? <Text>{org.email}</Text> : null}
          </View>
        </View>

        <Text style={s.h2}>Appliances</Text>
        {c.appliances.map((a) => (
          <ApplianceBlock key={a.applianceId} a={a} />
        ))}

        <View wrap={false}>
          <Text style={s.h2}>Room CO checks and tightness test</Text>
          {c.roomChecks.length === 0 ? <Text style={s.soft}>No room CO check recorded.</Text> : null}
          {c.roomChecks.map((r) => (
            <View key={r.room} style={s.tr}>
              <Text style={s.cName}>{r.room}</Text>
              <Text style={s.cName}>
                {fmt(r.coPpm, 0)} ppm{r.minutes !== null ? ` over ${fmt(r.minutes, 0)} min` : ''}
              </Text>
              <View style={s.cLevel}>
                <PdfVerdictMark level={r.level} size={7} />
              </View>
            </View>
          ))}
          {c.tightness ? (
            <View style={s.tr}>
              <Text style={s.cName}>Tightness test</Text>
              <Text style={s.cName}>
                {fmt(c.tightness.startMbar, 1)} → {fmt(c.tightness.endMbar, 1)} mbar over {fmt(c.tightness.durationMin, 0)} min (drop {fmt(c.tightness.dropMbar, 1)} mbar)
              </Text>
              <View style={s.cLevel}>
                <PdfVerdictMark level={c.tightness.level} size={7} />
              </View>
            </View>
          ) : (
            <Text style={s.soft}>No tightness test recorded.</Text>
          )}
        </View>

        <View wrap={false}>
          <Text style={s.h2}>Findings and actions</Text>
          {c.findings.length === 0 ? <Text style={s.soft}>No defects or hazards recorded.</Text> : null}
          {c.findings.map((f) => (
            <View key={f.id} style={s.tr}>
              <View style={s.cLevel}>
                <PdfVerdictMark level={f.severity === 'advice' ? 'clear' : f.severity} label={f.severityLabel} size={7} />
              </View>
              <Text style={s.cWide}>
                {f.description}
                {f.applianceLabel ? ` (${f.applianceLabel})` : ''}
              </Text>
              <Text style={s.cName}>{f.actionLabel}</Text>
            </View>
          ))}
          {c.makeSafe.map((m, i) => (
            <Text key={i} style={[s.itemLine, { color: PDF_COLOURS.ink }]}>
              Made safe: {m.madeSafeByLabel}
              {m.applianceLabel ? ` (${m.applianceLabel})` : ''}; occupant {m.consent === 'given' ? 'agreed' : 'refused'}
              {m.occupantName ? ` (${m.occupantName})` : ''}
              {m.warningNoticeLeft ? '; warning notice left' : ''}
              {m.refusalNote ? `; note: ${m.refusalNote}` : ''}.
            </Text>
          ))}
        </View>

        <View wrap={false}>
          <Text style={s.h2}>Sign-off</Text>
          {c.signoff ? (
            <>
              <Text>{c.signoff.declarationText}</Text>
              <Text style={s.soft}>
                Declared by {c.engineer.name} on {formatDate(c.signoff.declaredAt)}.{' '}
                {c.signoff.signed ? `Signed on site by ${c.signoff.occupantName ?? 'the occupant'}.` : `No occupant signature: ${(c.signoff.noSignatureReason ?? 'no reason given').replace(/\.+$/, '')}.`}
              </Text>
            </>
          ) : (
            <Text style={s.soft}>No sign-off recorded.</Text>
          )}
          <Text style={s.soft}>Issued by {c.issuedBy} for {org.name}.</Text>
        </View>

        <View style={s.caution} wrap={false}>
          <Text style={[s.strong, { marginBottom: 2 }]}>Please read</Text>
          <Bullets lines={c.caution} />
          <Text style={[s.strong, { marginTop: 5, color: roomCoHigh ? PDF_COLOURS.danger : PDF_COLOURS.ink }]}>If room CO is high, or a CO alarm sounds:</Text>
          <Bullets lines={c.roomCoAdvice} />
        </View>

        <View style={s.footer} fixed>
          <Text>
            Certificate {c.numberText} · check at {c.checkUrl}
          </Text>
          <Text render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`} />
        </View>
      </Page>
    </Document>
  );
}

/**
 * The check URL as a PNG data URL. Four pixels a module (156 px for a 37-module code in a 92 pt
 * box, about 120 dpi) keeps every module an exact square, and an RGB image without an alpha
 * channel (pngjs's colorType 2, passed through by qrcode to pngjs) is embedded by pdfkit as it
 * is, where an RGBA one is decoded and split into image and mask on every render.
 */
export async function qrDataUrlFor(url: string): Promise<string> {
  const options: QRCode.QRCodeToDataURLOptions & { rendererOpts: { colorType: 2 } } = {
    errorCorrectionLevel: 'M',
    margin: 1,
    scale: 4,
    color: { dark: '#1b2030', light: '#ffffff' },
    rendererOpts: { colorType: 2 },
  };
  return QRCode.toDataURL(url, options);
}

export async function renderCertificatePdf(content: CertificateContent, voided: VoidMarking | null = null): Promise<Buffer> {
  registerPdfFonts();
  const qrDataUrl = await qrDataUrlFor(content.checkUrl);
  return renderToBuffer(<CertificateDocument content={content} qrDataUrl={qrDataUrl} voided={voided} />);
}

export function certificatePdfFilename(numberText: string, voided = false): string {
  return `certificate-${numberText}${voided ? '-void' : ''}.pdf`;
}
