// A locked version as a LaTeX article for pdflatex (standard packages only: amsmath, amssymb,
// geometry, longtable, hyperref): the text and its math as written, flow blocks as equations,
// each claim with its verdict (word and symbol), and an appendix with the check report (every
// claim's measured and claimed value, uncertainty, tolerance, method and settings, the software
// versions) and the SHA-256 with how to compute it again.
import { parse } from 'mathjs';
import { BLOCK_FIELD, BLOCK_ROW, CLAIM_BLOCK, FLOW_BLOCK, claimFields, isClaimKind, type DocNode } from '../../flow/document';
import { messageParts } from '../../flow/format';
import type { ClaimResult, Measured, Status } from '../../flow/types';
import { LOCK_HASH_FORMAT } from './hash';
import type { CheckReport } from './report';

const SPECIAL: Record<string, string> = {
  '\\': '\\textbackslash{}',
  '&': '\\&',
  '%': '\\%',
  $: '\\$',
  '#': '\\#',
  _: '\\_',
  '{': '\\{',
  '}': '\\}',
  '~': '\\textasciitilde{}',
  '^': '\\textasciicircum{}',
};

// Characters pdflatex's T1 text fonts lack, written as LaTeX.
const UNICODE: Record<string, string> = {
  α: '\\ensuremath{\\alpha}', β: '\\ensuremath{\\beta}', γ: '\\ensuremath{\\gamma}', δ: '\\ensuremath{\\delta}', ε: '\\ensuremath{\\varepsilon}',
  ζ: '\\ensuremath{\\zeta}', η: '\\ensuremath{\\eta}', θ: '\\ensuremath{\\theta}', κ: '\\ensuremath{\\kappa}', λ: '\\ensuremath{\\lambda}',
  μ: '\\ensuremath{\\mu}', ν: '\\ensuremath{\\nu}', ξ: '\\ensuremath{\\xi}', π: '\\ensuremath{\\pi}', ρ: '\\ensuremath{\\rho}',
  σ: '\\ensuremath{\\sigma}', τ: '\\ensuremath{\\tau}', φ: '\\ensuremath{\\phi}', χ: '\\ensuremath{\\chi}', ψ: '\\ensuremath{\\psi}',
  ω: '\\ensuremath{\\omega}', Γ: '\\ensuremath{\\Gamma}', Δ: '\\ensuremath{\\Delta}', Λ: '\\ensuremath{\\Lambda}', Φ: '\\ensuremath{\\Phi}',
  Ω: '\\ensuremath{\\Omega}', '→': '\\ensuremath{\\to}', '≈': '\\ensuremath{\\approx}', '≤': '\\ensuremath{\\le}', '≥': '\\ensuremath{\\ge}',
  '×': '\\ensuremath{\\times}', '±': '\\ensuremath{\\pm}', '−': '\\ensuremath{-}', '∞': '\\ensuremath{\\infty}', '∼': '\\ensuremath{\\sim}',
  '·': '\\ensuremath{\\cdot}', '’': "'", '‘': '`', '“': '``', '”': "''", '–': '--', '—': '---', '…': '\\ldots{}', '\u00a0': '~',
};

/** A verdict message for LaTeX: its exponents raised whole (eps^3.01 as eps\textsuperscript{3.01}), the rest escaped. */
export function messageLatex(message: string): string {
  return messageParts(message)
    .map((part) => (part.exponent ? `\\textsuperscript{${escapeLatex(part.text)}}` : escapeLatex(part.text)))
    .join('');
}

/** Text for LaTeX: specials escaped; characters outside the text fonts as math or a code point. */
export function escapeLatex(text: string): string {
  let out = '';
  for (const ch of text) {
    if (ch in SPECIAL) out += SPECIAL[ch];
    else if (ch in UNICODE) out += UNICODE[ch];
    else if (ch.codePointAt(0)! < 0x80 || /[\u00c0-\u017f]/.test(ch)) out += ch;
    else out += `\\texttt{U+${ch.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0')}}`;
  }
  return out;
}

/** Math source as written by the author; a lone line break or an unbalanced brace must not end the document. */
function mathSource(source: string): string {
  const trimmed = source.trim().replace(/\n{2,}/g, '\n');
  let depth = 0;
  for (const ch of trimmed.replace(/\\[{}]/g, '')) {
    if (ch === '{') depth++;
    if (ch === '}') depth--;
    if (depth < 0) return `\\text{\\texttt{${escapeLatex(trimmed)}}}`;
  }
  return depth === 0 ? trimmed : `\\text{\\texttt{${escapeLatex(trimmed)}}}`;
}

function textOf(node: DocNode): string {
  if (typeof node.text === 'string') return node.text;
  return (node.content ?? []).map(textOf).join('');
}

function inline(nodes: readonly DocNode[] | undefined): string {
  return (nodes ?? [])
    .map((node) => {
      if (node.type === 'text') {
        let out = escapeLatex(node.text ?? '');
        for (const mark of (node as DocNode & { marks?: { type: string; attrs?: Record<string, unknown> }[] }).marks ?? []) {
          if (mark.type === 'bold') out = `\\textbf{${out}}`;
          else if (mark.type === 'italic') out = `\\emph{${out}}`;
          else if (mark.type === 'code') out = `\\texttt{${out}}`;
          else if (mark.type === 'link' && typeof mark.attrs?.href === 'string') out = `\\href{${escapeLatex(mark.attrs.href).replace(/\\textasciitilde\{\}/g, '\\~')}}{${out}}`;
        }
        return out;
      }
      if (node.type === 'mathInline') return `$${mathSource(textOf(node))}$`;
      if (node.type === 'hardBreak') return '\\\\\n';
      return inline(node.content);
    })
    .join('');
}

/** A mathjs expression as LaTeX (mathjs's own toTex), or as typewriter text when it does not parse. */
function expressionTex(source: string): string {
  try {
    return `$${parse(source).toTex({ parenthesis: 'auto', implicit: 'hide' })}$`;
  } catch {
    return `\\texttt{${escapeLatex(source)}}`;
  }
}

function fieldsOf(node: DocNode): Map<string, string> {
  const fields = new Map<string, string>();
  for (const child of node.content ?? []) {
    if (child.type === BLOCK_FIELD && typeof child.attrs?.field === 'string' && !fields.has(child.attrs.field)) fields.set(child.attrs.field, textOf(child));
  }
  return fields;
}

const VERDICT_MACRO: Record<Status, string> = {
  holds: '\\verdictholds',
  fails: '\\verdictfails',
  inconclusive: '\\verdictinconclusive',
  invalid: '\\verdictinvalid',
};

function flowBlock(node: DocNode): string {
  const fields = fieldsOf(node);
  const rows = (node.content ?? []).filter((c) => c.type === BLOCK_ROW);
  const lines: string[] = [`\\paragraph{Flow block${fields.get('name') ? ` ${escapeLatex(fields.get('name')!)}` : ''}.}`];
  lines.push(`Couplings: ${escapeLatex(fields.get('couplings') ?? '')}; convention: ${escapeLatex(fields.get('convention') ?? '')}.`);
  const row = (kind: string) =>
    rows
      .filter((r) => r.attrs?.row === kind)
      .map((r) => {
        const [name, value] = (r.content ?? []).map(textOf);
        return { name: name ?? '', value: value ?? '' };
      });
  const parameters = row('parameter');
  if (parameters.length > 0) lines.push(`Parameters: ${parameters.map((p) => `${escapeLatex(p.name)} $=$ ${expressionTex(p.value)}`).join(', ')}.`);
  for (const [kind, label] of [['beta', 'Beta function of'], ['rate', 'Rate']] as const) {
    for (const r of row(kind)) lines.push(`\\\\\n${label} ${escapeLatex(r.name)}: ${expressionTex(r.value)}`);
  }
  return lines.join('\n');
}

function claimBlock(node: DocNode, result: ClaimResult | undefined): string {
  const fields = fieldsOf(node);
  const kind = typeof node.attrs?.kind === 'string' ? node.attrs.kind : '';
  const labels = new Map<string, string>(isClaimKind(kind) ? claimFields(kind).map((f) => [f.key, f.label] as [string, string]) : []);
  const name = fields.get('name') || result?.id || 'claim';
  const status: Status = result?.status ?? 'invalid';
  const lines = [`\\paragraph{Claim \\texttt{${escapeLatex(name)}} (${escapeLatex(kind.replace(/-/g, ' '))}) \\hfill ${VERDICT_MACRO[status]}}`];
  const rows: string[] = [];
  for (const [key, value] of fields) {
    if (key === 'name' || value.trim() === '') continue;
    rows.push(`${escapeLatex(labels.get(key) ?? key)} & ${key === 'note' ? escapeLatex(value) : expressionTex(value)} \\\\`);
  }
  if (rows.length > 0) lines.push(`\\begin{tabular}{@{}p{0.28\\linewidth}p{0.68\\linewidth}@{}}\n${rows.join('\n')}\n\\end{tabular}`);
  if (result?.message) lines.push(`\\par\\noindent\\emph{Check:} ${messageLatex(result.message)} (see appendix, claim \\ref{claim:${labelOf(result.id)}}).`);
  return lines.join('\n');
}

function labelOf(id: string): string {
  return id.replace(/[^A-Za-z0-9-]/g, '-');
}

function block(node: DocNode, resultOf: (stepId: string) => ClaimResult | undefined): string {
  switch (node.type) {
    case 'heading': {
      const level = Number(node.attrs?.level ?? 2);
      return `\\${level <= 1 ? 'section' : level === 2 ? 'subsection' : 'subsubsection'}{${inline(node.content)}}`;
    }
    case 'paragraph':
      return inline(node.content);
    case 'mathDisplay':
      return `\\[\n${mathSource(textOf(node))}\n\\]`;
    case 'bulletList':
    case 'orderedList': {
      const env = node.type === 'bulletList' ? 'itemize' : 'enumerate';
      const items = (node.content ?? []).map((item) => `\\item ${(item.content ?? []).map((c) => block(c, resultOf)).join('\n\n')}`);
      return items.length ? `\\begin{${env}}\n${items.join('\n')}\n\\end{${env}}` : '';
    }
    case 'blockquote':
      return `\\begin{quote}\n${(node.content ?? []).map((c) => block(c, resultOf)).join('\n\n')}\n\\end{quote}`;
    case 'codeBlock':
      return `\\begin{quote}\\ttfamily\n${escapeLatex(textOf(node)).replace(/\n/g, '\\\\\n')}\n\\end{quote}`;
    case 'horizontalRule':
      return '\\medskip\\noindent\\hrulefill\\medskip';
    case FLOW_BLOCK:
      return flowBlock(node);
    case CLAIM_BLOCK:
      return claimBlock(node, resultOf(typeof node.attrs?.stepId === 'string' ? node.attrs.stepId : ''));
    default:
      if (/plot/i.test(node.type)) return '\\paragraph{Trajectory plot.} \\emph{Drawn interactively in Marginalia; the SVG export holds the figure.}';
      return escapeLatex(textOf(node));
  }
}

function number(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  return Number(value.toPrecision(8)).toString();
}

function measuredText(value: Measured | null): string {
  if (value === null || value === undefined) return '--';
  if (typeof value === 'number') return number(value);
  if (Array.isArray(value)) return value.map((v) => (typeof v === 'number' ? number(v) : `${number(v.re)}${v.im >= 0 ? '+' : '-'}${number(Math.abs(v.im))}i`)).join(', ');
  return Object.entries(value)
    .map(([k, v]) => `${k} = ${number(v)}`)
    .join(', ');
}

function settingsText(record: Record<string, number | string | boolean>): string {
  const entries = Object.entries(record);
  return entries.length === 0 ? '--' : entries.map(([k, v]) => `${k} = ${typeof v === 'number' ? number(v) : String(v)}`).join(', ');
}

function appendix(report: CheckReport, sha256: string): string {
  const rows = report.claims.map(
    (c) =>
      `\\texttt{${escapeLatex(c.id)}} & ${escapeLatex(c.kind)} & ${VERDICT_MACRO[c.status]} & ${escapeLatex(measuredText(c.result.measured))} & ${escapeLatex(measuredText(c.result.expected))} & ${c.result.uncertainty === null ? '--' : escapeLatex(number(c.result.uncertainty))} & ${c.result.tolerance === null ? '--' : escapeLatex(number(c.result.tolerance))} \\\\`,
  );
  const details = report.claims.map((c) =>
    [
      `\\subsection*{Claim \\texttt{${escapeLatex(c.id)}}}\\label{claim:${labelOf(c.id)}}`,
      `\\begin{description}`,
      `\\item[Verdict] ${VERDICT_MACRO[c.status]} ${messageLatex(c.result.message)}`,
      `\\item[Method] ${escapeLatex(c.result.method)}`,
      `\\item[Solver settings] ${escapeLatex(settingsText(c.result.settings))}`,
      `\\item[Statistics] ${escapeLatex(settingsText(c.result.stats))}; ${escapeLatex(number(c.result.ms))} ms`,
      ...(c.result.sanity.length ? [`\\item[Sanity checks] ${c.result.sanity.map((f) => `${escapeLatex(f.check)}: ${f.ok ? 'ok' : 'flagged'} (${escapeLatex(f.message)})`).join('; ')}`] : []),
      `\\end{description}`,
    ].join('\n'),
  );
  const hashGroups = sha256.match(/.{1,16}/g)?.join(' ') ?? sha256;
  const software = Object.entries(report.software).map(([k, v]) => `${escapeLatex(k)} ${escapeLatex(v)}`).join(', ');
  return [
    '\\appendix',
    '\\section{Check report}',
    `Version ${report.version.number} (\`\`${escapeLatex(report.version.name)}'') of this derivation was locked by ${escapeLatex(report.lockedBy.name)} on ${escapeLatex(report.lockedAt.replace('T', ' ').slice(0, 16))} UTC. ` +
      `At the lock the server checked each of its ${report.summary.claims} claim${report.summary.claims === 1 ? '' : 's'} afresh with Marginalia's solver; ${report.summary.holds} hold. ` +
      `Time bound per claim: ${report.solver.timeLimitMsPerClaim} ms. Software: ${software}. A numerical check is evidence, not a proof.`,
    '',
    '\\begin{longtable}{@{}p{0.16\\linewidth}p{0.12\\linewidth}p{0.12\\linewidth}p{0.16\\linewidth}p{0.16\\linewidth}p{0.09\\linewidth}p{0.08\\linewidth}@{}}',
    'Claim & Kind & Verdict & Measured & Claimed & Uncertainty & Tolerance \\\\ \\hline\\endhead',
    ...(rows.length ? rows : ['\\multicolumn{7}{@{}l}{This version has no claims.} \\\\']),
    '\\end{longtable}',
    ...details,
    '\\subsection*{SHA-256 of the locked version}',
    `\\texttt{${hashGroups}}`,
    '',
    `It is the SHA-256 of these bytes (format \`\`${escapeLatex(LOCK_HASH_FORMAT)}''): the line \\texttt{${escapeLatex(LOCK_HASH_FORMAT)}}, a line break, ` +
      '\\texttt{snapshot} followed by a space, the snapshot\'s length in bytes in decimal and a line break, the snapshot\'s bytes, a line break, ' +
      '\\texttt{report} followed by a space, the check report\'s length in bytes and a line break, then the report\'s bytes (the JSON file as downloaded). ' +
      `The snapshot's own SHA-256 is \\texttt{${report.snapshotSha256.match(/.{1,16}/g)!.join(' ')}}.`,
  ].join('\n');
}

export function latexArticle(input: { body: DocNode; report: CheckReport; sha256: string }): string {
  const results = new Map(input.report.claims.map((c) => [c.stepId, c.result]));
  const blocks = (input.body.content ?? []).map((node) => block(node, (stepId) => results.get(stepId))).filter((b) => b.trim() !== '');
  const { report } = input;
  return [
    '% Written by Marginalia from a locked version; compile with pdflatex.',
    '\\documentclass[11pt]{article}',
    '\\usepackage[T1]{fontenc}',
    '\\usepackage[utf8]{inputenc}',
    '\\usepackage{amsmath,amssymb}',
    '\\usepackage[margin=2.5cm]{geometry}',
    '\\usepackage{longtable}',
    '\\usepackage[hidelinks]{hyperref}',
    '\\newcommand{\\verdictholds}{\\fbox{\\small $\\checkmark$ holds}}',
    '\\newcommand{\\verdictfails}{\\fbox{\\small $\\times$ fails}}',
    '\\newcommand{\\verdictinconclusive}{\\fbox{\\small ? inconclusive}}',
    '\\newcommand{\\verdictinvalid}{\\fbox{\\small ! invalid input}}',
    `\\title{${escapeLatex(report.derivation.title)}}`,
    `\\author{${escapeLatex(report.derivation.group)}}`,
    `\\date{Locked version ${report.version.number}, ${escapeLatex(report.lockedAt.slice(0, 10))}}`,
    '\\begin{document}',
    '\\maketitle',
    `\\noindent Every claim below was checked by Marginalia's solver when this version was locked; its verdict stands beside it. SHA-256: \\texttt{${input.sha256.slice(0, 16)}\\ldots} (in full in the appendix).`,
    '',
    blocks.join('\n\n'),
    '',
    appendix(report, input.sha256),
    '\\end{document}',
    '',
  ].join('\n');
}
