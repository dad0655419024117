// The two documents the PDF benchmark renders, loaded through jiti by pdf.ts (see there for why):
// the one-page, 40-line baseline and the real certificate renderer.
import { Document, Page, Text, renderToBuffer } from '@react-pdf/renderer';
import { PDF_FONT, registerPdfFonts } from '@/lib/pdf/fonts';

export { renderCertificatePdf } from '@/lib/pdf/certificate-document';

function BaselineDocument() {
  return (
    <Document>
      <Page size="A4" style={{ fontFamily: PDF_FONT, fontSize: 10, padding: 40 }}>
        {Array.from({ length: 40 }, (_, i) => (
          <Text key={i}>Line {i + 1}: the quick brown fox jumps over the lazy dog, 0123456789.</Text>
        ))}
      </Page>
    </Document>
  );
}

/** Same fonts as the certificate, so the ratio compares layout work rather than font loading. */
export function renderBaselinePdf(): Promise<Buffer> {
  registerPdfFonts();
  return renderToBuffer(<BaselineDocument />);
}
