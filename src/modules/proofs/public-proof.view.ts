/** The public check's page: a few plain lines a warranty clerk can read on a phone. */
import type { ProofsService } from './proofs.service';

type Answer = Awaited<ReturnType<ProofsService['publicCheck']>>;

const escape = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

export function publicProofPage(a: Answer): string {
  const rows = a.known
    ? [
        ['Status', a.current ? 'Current: the repair order’s evidence still matches this document.' : `Superseded: changed since by ${a.supersededBy.join(', ')}.`],
        ['Issued by', a.shop],
        ['Issued on', a.issuedOn],
        ['Repair order', a.repairOrderNumber],
        ['VIN', a.vin],
      ]
    : [['Status', a.message]];
  const title = a.known ? (a.current ? 'Proof of repair: known and current' : 'Proof of repair: known, superseded') : 'Proof of repair: not known here';
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escape(title)}</title><link rel="stylesheet" href="/assets/css/tracebay.css"></head>
<body><main>
<h1>${escape(title)}</h1>
<dl>${rows.map(([k, v]) => `<dt>${escape(k!)}</dt><dd>${escape(v!)}</dd>`).join('')}</dl>
<p>Evidence digest: <code>sha256:${escape(a.digest)}</code></p>
<p>This page names no people and shows no readings; the issuing shop holds the full record.</p>
</main></body></html>`;
}
