// HTML for the payment fake's hosted checkout page: plain server-rendered markup, no scripts,
// readable without CSS. Edit when the page needs new states; the flow lives in payment-fake.ts.

export interface PageLineItem {
  name: string;
  quantity: number;
  amountTotal: number;
}

export interface CheckoutView {
  sessionId: string;
  amountTotal: number;
  currency: string;
  lineItems: PageLineItem[];
  cancelUrl: string | null;
  /** An error is announced to assistive technology as soon as the page loads. */
  notice?: { kind: 'error' | 'info'; text: string };
  cardNumber?: string;
}

export interface MessageView {
  heading: string;
  text: string;
  link?: { href: string; label: string };
}

export const PAGE_TITLE = 'Test card payment (local fake)';
export const TEST_CARD_HINT = 'Use a test card: 4242 4242 4242 4242 pays, 4000 0000 0000 0002 is declined';

// ISO 4217 currencies without minor units, where amounts are already whole units.
const ZERO_DECIMAL = new Set(['bif', 'clp', 'djf', 'gnf', 'jpy', 'kmf', 'krw', 'mga', 'pyg', 'rwf', 'ugx', 'vnd', 'vuv', 'xaf', 'xof', 'xpf']);

export function formatAmount(amountMinor: number, currency: string): string {
  const units = ZERO_DECIMAL.has(currency.toLowerCase()) ? amountMinor : amountMinor / 100;
  try {
    return new Intl.NumberFormat('en-GB', { style: 'currency', currency: currency.toUpperCase() }).format(units);
  } catch {
    return `${units.toFixed(2)} ${currency.toUpperCase()}`;
  }
}

export function escapeHtml(value: string): string {
  return value.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
}

const STYLE = `
  :root { color-scheme: light; --ink: #1b2430; --muted: #4a5565; --line: #d5dbe3; --accent: #0b5cad; --bad: #a4161a; --bad-bg: #fdecec; --note-bg: #fff7d6; }
  * { box-sizing: border-box; }
  body { margin: 0; font: 16px/1.5 system-ui, -apple-system, "Segoe UI", Roboto, sans-serif; color: var(--ink); background: #f3f5f8; }
  main { max-width: 30rem; margin: 2rem auto; padding: 1.5rem; background: #fff; border: 1px solid var(--line); border-radius: 12px; }
  h1 { font-size: 1.35rem; margin: 0 0 .25rem; }
  .badge { display: inline-block; font-size: .85rem; background: var(--note-bg); border: 1px solid #e6d27a; border-radius: 999px; padding: .1rem .6rem; margin-bottom: 1rem; }
  table { width: 100%; border-collapse: collapse; margin: 1rem 0; }
  th, td { text-align: left; padding: .4rem 0; border-bottom: 1px solid var(--line); }
  td.num, th.num { text-align: right; }
  tfoot th, tfoot td { font-weight: 700; border-bottom: 0; }
  label { display: block; font-weight: 600; margin-top: 1rem; }
  .hint { color: var(--muted); font-size: .9rem; margin: .25rem 0 .5rem; }
  input { width: 100%; font: inherit; font-size: 1.1rem; letter-spacing: .05em; padding: .6rem .75rem; border: 1px solid #8a94a3; border-radius: 8px; }
  input[aria-invalid="true"] { border-color: var(--bad); }
  :focus-visible { outline: 3px solid #5aa0ec; outline-offset: 2px; }
  button { width: 100%; margin-top: 1rem; font: inherit; font-weight: 700; padding: .75rem; color: #fff; background: var(--accent); border: 0; border-radius: 8px; cursor: pointer; }
  button:hover { background: #084a8c; }
  .notice { border-radius: 8px; padding: .75rem 1rem; margin: 1rem 0; }
  .notice.error { color: var(--bad); background: var(--bad-bg); border: 1px solid #f2b8b9; }
  .notice.info { background: #eef4fb; border: 1px solid #bcd3ee; }
  .cancel { display: inline-block; margin-top: 1rem; color: var(--accent); }
`;

function layout(body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(PAGE_TITLE)}</title>
<style>${STYLE}</style>
</head>
<body>
<main>
<h1>${escapeHtml(PAGE_TITLE)}</h1>
<p class="badge">No real money moves: this page stands in for a card processor.</p>
${body}
</main>
</body>
</html>`;
}

export function renderCheckoutPage(view: CheckoutView): string {
  const rows = view.lineItems
    .map(
      (item) =>
        `<tr><td>${escapeHtml(item.name)}</td><td class="num">${item.quantity}</td><td class="num">${escapeHtml(formatAmount(item.amountTotal, view.currency))}</td></tr>`,
    )
    .join('\n');
  const total = escapeHtml(formatAmount(view.amountTotal, view.currency));
  const isError = view.notice?.kind === 'error';
  const notice = view.notice
    ? `<div id="payment-notice" class="notice ${view.notice.kind}" ${isError ? 'role="alert"' : 'role="status"'}>${escapeHtml(view.notice.text)}</div>`
    : '';
  const describedBy = ['card-hint', ...(view.notice ? ['payment-notice'] : [])].join(' ');
  const cancel = view.cancelUrl ? `<a class="cancel" href="${escapeHtml(view.cancelUrl)}">Cancel and return to the site</a>` : '';
  return layout(`
<table>
<caption class="hint">Amount due</caption>
<thead><tr><th scope="col">Description</th><th scope="col" class="num">Qty</th><th scope="col" class="num">Amount</th></tr></thead>
<tbody>
${rows}
</tbody>
<tfoot><tr><th scope="row" colspan="2">Total</th><td class="num" data-testid="amount-total">${total}</td></tr></tfoot>
</table>
${notice}
<form method="post" action="/pay/${encodeURIComponent(view.sessionId)}">
<label for="card_number">Card number</label>
<p id="card-hint" class="hint">${escapeHtml(TEST_CARD_HINT)}.</p>
<input id="card_number" name="card_number" type="text" inputmode="numeric" autocomplete="cc-number" required
  placeholder="4242 4242 4242 4242" value="${escapeHtml(view.cardNumber ?? '')}" aria-describedby="${describedBy}"${isError ? ' aria-invalid="true" autofocus' : ''}>
<button type="submit">Pay ${total}</button>
</form>
${cancel}`);
}

export function renderMessagePage(view: MessageView): string {
  const link = view.link ? `<p><a class="cancel" href="${escapeHtml(view.link.href)}">${escapeHtml(view.link.label)}</a></p>` : '';
  return layout(`
<h2>${escapeHtml(view.heading)}</h2>
<div class="notice info" role="status">${escapeHtml(view.text)}</div>
${link}`);
}
