// Reading a .tex file into the blocks of a derivation: sections become headings, paragraphs stay
// paragraphs (with emphasis, bold, code and links), inline and display math keep their LaTeX
// (equation, align and their kin become display math KaTeX can typeset), lists stay lists. What
// has no place in a derivation (figures, tables, bibliographies, unknown commands) is listed with
// its line, never dropped silently. Parsing by unified-latex; pure otherwise.
import type * as Ast from '@unified-latex/unified-latex-types';
import { parse } from '@unified-latex/unified-latex-util-parse';
import { expandMacros, type MacroDefinition } from './macros';

export type Mark = { type: 'bold' } | { type: 'italic' } | { type: 'code' } | { type: 'link'; href: string };

export type Inline = { kind: 'text'; text: string; marks: Mark[] } | { kind: 'math'; latex: string };

export type Block =
  | { kind: 'heading'; level: 1 | 2 | 3; content: Inline[] }
  | { kind: 'paragraph'; content: Inline[] }
  | { kind: 'math'; latex: string }
  | { kind: 'list'; ordered: boolean; items: Block[][] };

/** Something in the file that was not imported as it stands, with where it was. */
export interface LeftOut {
  what: string;
  /** Lines where it occurs (the first few). */
  lines: number[];
  count: number;
  detail: string;
}

export interface ImportedLatex {
  title: string | null;
  blocks: Block[];
  leftOut: LeftOut[];
}

const MAX_LINES_LISTED = 8;

// ---- the fixed vocabulary ----------------------------------------------------------------------

const sectionLevels: Record<string, number> = { part: 0, chapter: 0, section: 1, subsection: 2, subsubsection: 3 };
const runInHeadings = new Set(['paragraph', 'subparagraph']);
const italicMacros = new Set(['emph', 'textit', 'textsl', 'mathit']);
const boldMacros = new Set(['textbf', 'bm', 'boldsymbol']);
const codeMacros = new Set(['texttt', 'path']);
const plainMacros = new Set(['textrm', 'textsf', 'textsc', 'textup', 'textnormal', 'mbox', 'text', 'textmd', 'underline', 'uline', 'hbox']);
const citeMacros = new Set(['cite', 'citep', 'citet', 'citealp', 'citeauthor', 'citeyear', 'nocite', 'parencite', 'textcite']);
const refMacros = new Set(['ref', 'eqref', 'autoref', 'cref', 'Cref', 'pageref', 'nameref']);
const definitionMacros = new Set(['newcommand', 'renewcommand', 'providecommand', 'DeclareMathOperator']);
/** Commands that only lay out the printed page: left out, counted once. */
const layoutMacros = new Set([
  'maketitle', 'tableofcontents', 'newpage', 'clearpage', 'cleardoublepage', 'pagebreak', 'linebreak', 'nopagebreak', 'noindent',
  'indent', 'centering', 'raggedright', 'raggedleft', 'small', 'footnotesize', 'scriptsize', 'tiny', 'large', 'Large', 'LARGE',
  'huge', 'Huge', 'normalsize', 'smallskip', 'medskip', 'bigskip', 'vspace', 'hspace', 'vfill', 'hfill', 'par', 'appendix',
  'onecolumngrid', 'twocolumngrid', 'frontmatter', 'mainmatter', 'backmatter', 'selectlanguage', 'pagestyle', 'thispagestyle',
  'setlength', 'addtolength', 'setcounter', 'allowdisplaybreaks', 'protect', 'relax', 'sloppy', 'fussy', 'leavevmode', 'null',
  'rmfamily', 'sffamily', 'ttfamily', 'bfseries', 'itshape', 'upshape', 'mdseries', 'normalfont', 'em', 'it', 'bf', 'rm', 'tt',
]);
/** Front matter that belongs to the paper, not to a derivation (its authors are the group's members). */
const frontMatterMacros = new Set(['author', 'date', 'thanks', 'affiliation', 'address', 'email', 'institute', 'keywords', 'pacs', 'preprint']);
const symbolMacros: Record<string, string> = {
  '%': '%', '&': '&', $: '$', _: '_', '#': '#', '{': '{', '}': '}', ' ': ' ', ',': ' ', ';': ' ', ':': ' ', '!': '', '/': '',
  '-': '', '@': '', ldots: '…', dots: '…', textellipsis: '…', LaTeX: 'LaTeX', TeX: 'TeX', S: '§', P: '¶', ss: 'ß', o: 'ø', O: 'Ø',
  ae: 'æ', AE: 'Æ', aa: 'å', AA: 'Å', l: 'ł', L: 'Ł', i: 'ı', textendash: '–', textemdash: '—', textbullet: '•', copyright: '©',
  textdegree: '°', quad: ' ', qquad: ' ', enspace: ' ', thinspace: ' ', textbackslash: '\\', textasciitilde: '~', slash: '/',
  textquoteleft: '‘', textquoteright: '’', textquotedblleft: '“', textquotedblright: '”', today: '', dag: '†', ddag: '‡',
};
const accents: Record<string, string> = { "'": '\u0301', '`': '\u0300', '^': '\u0302', '"': '\u0308', '~': '\u0303', '=': '\u0304', '.': '\u0307', u: '\u0306', v: '\u030c', H: '\u030b', c: '\u0327', k: '\u0328', r: '\u030a' };
const theoremLike: Record<string, string> = {
  theorem: 'Theorem', lemma: 'Lemma', proposition: 'Proposition', corollary: 'Corollary', definition: 'Definition', remark: 'Remark',
  proof: 'Proof', claim: 'Claim', conjecture: 'Conjecture', example: 'Example', note: 'Note', assumption: 'Assumption', observation: 'Observation',
};
const passThroughEnvironments = new Set(['center', 'flushleft', 'flushright', 'quote', 'quotation', 'minipage', 'small', 'footnotesize', 'sloppypar', 'landscape', 'multicols']);
/** Environments with no place in a derivation, and why. */
const leftOutEnvironments: Record<string, string> = {
  figure: 'figures are not imported; add a trajectory plot or an image by hand',
  'figure*': 'figures are not imported; add a trajectory plot or an image by hand',
  table: 'tables are not imported; a table of numbers can be uploaded as a dataset',
  'table*': 'tables are not imported; a table of numbers can be uploaded as a dataset',
  tabular: 'tables are not imported; a table of numbers can be uploaded as a dataset',
  tikzpicture: 'drawings are not imported',
  picture: 'drawings are not imported',
  thebibliography: 'the bibliography is not imported',
  algorithm: 'algorithms are not imported',
  algorithmic: 'algorithms are not imported',
  lstlisting: 'program listings are not imported',
  verbatim: 'verbatim text is not imported',
  comment: 'commented-out text is not imported',
};
/** Math environments and the KaTeX form they take inside display math. */
const mathEnvironments: Record<string, string | null> = {
  equation: null, 'equation*': null, displaymath: null, math: null,
  align: 'aligned', 'align*': 'aligned', flalign: 'aligned', 'flalign*': 'aligned', eqnarray: 'aligned', 'eqnarray*': 'aligned',
  alignat: 'alignedat', 'alignat*': 'alignedat',
  gather: 'gathered', 'gather*': 'gathered', multline: 'gathered', 'multline*': 'gathered',
  subequations: null,
};

// ---- helpers -------------------------------------------------------------------------------------

function envName(node: Ast.Environment): string {
  const env = node.env as unknown;
  if (typeof env === 'string') return env;
  if (env && typeof env === 'object' && 'content' in env) return String((env as { content: unknown }).content);
  return '';
}

function lineOf(node: Ast.Node | Ast.Argument | undefined): number | null {
  return node?.position?.start.line ?? null;
}

/** The last non-empty argument of a macro, the usual place of its main argument. */
function mainArgument(node: Ast.Macro): Ast.Node[] | null {
  const args = node.args ?? [];
  for (let i = args.length - 1; i >= 0; i--) if (args[i]!.openMark === '{' || args[i]!.content.length > 0) return args[i]!.content;
  return null;
}

function optionalArgument(node: Ast.Macro | Ast.Environment): Ast.Node[] | null {
  const arg = (node.args ?? []).find((a) => a.openMark === '[' && a.content.length > 0);
  return arg ? arg.content : null;
}

/** An accent sits on i, not on the dotless ı that \\i gives for it. */
const dotted = (letter: string) => (letter === 'ı' ? 'i' : letter);

/** TeX's ligatures for quotes and dashes, and ~ as a non-breaking space. */
function typographic(text: string): string {
  return text.replace(/---/g, '—').replace(/--/g, '–').replace(/``/g, '“').replace(/''/g, '”').replace(/`/g, '‘').replace(/'/g, '’').replace(/~/g, '\u00a0');
}

// ---- the reader ------------------------------------------------------------------------------------

interface Context {
  marks: Mark[];
}

class LatexReader {
  private readonly blocks: Block[] = [];
  private paragraph: Inline[] = [];
  private readonly leftOut = new Map<string, LeftOut>();
  private readonly macros = new Map<string, MacroDefinition>();
  private title: string | null = null;
  private hasTitle = false;
  private comments = 0;
  private commentLines: number[] = [];
  private depth = 0;

  constructor(private readonly source: string) {}

  read(): ImportedLatex {
    const root = parse(this.source);
    const documentNode = root.content.find((n): n is Ast.Environment => n.type === 'environment' && envName(n) === 'document');
    if (documentNode) {
      const preamble = root.content.slice(0, root.content.indexOf(documentNode));
      this.readPreamble(preamble);
      // The title becomes the first heading only where \maketitle prints it; sections sit below it then.
      this.hasTitle = this.title !== null && documentNode.content.some((n) => n.type === 'macro' && n.content === 'maketitle');
      this.walkBlocks(documentNode.content, { marks: [] });
      const after = root.content.slice(root.content.indexOf(documentNode) + 1).filter((n) => n.type !== 'whitespace' && n.type !== 'parbreak' && n.type !== 'comment');
      if (after.length > 0) this.note('text after \\end{document}', lineOf(after[0]), 'LaTeX ignores it, and so does the import');
    } else {
      this.hasTitle = root.content.some((n) => n.type === 'macro' && n.content === 'title');
      this.walkBlocks(root.content, { marks: [] });
    }
    this.flush();
    if (this.comments > 0) {
      const key = 'comments';
      this.leftOut.set(key, { what: 'comments (% …)', lines: this.commentLines.slice(0, MAX_LINES_LISTED), count: this.comments, detail: 'comments are not part of the text' });
    }
    return { title: this.title, blocks: this.blocks, leftOut: [...this.leftOut.values()] };
  }

  private note(what: string, line: number | null, detail: string): void {
    const entry = this.leftOut.get(what);
    if (entry) {
      entry.count++;
      if (line !== null && entry.lines.length < MAX_LINES_LISTED && !entry.lines.includes(line)) entry.lines.push(line);
      return;
    }
    this.leftOut.set(what, { what, lines: line === null ? [] : [line], count: 1, detail });
  }

  // -- preamble: the title and the author's macros; the rest (class, packages) is noted once.
  private readPreamble(nodes: Ast.Node[]): void {
    let packages = 0;
    for (let i = 0; i < nodes.length; i++) {
      const node = nodes[i]!;
      if (node.type === 'comment') continue;
      if (node.type !== 'macro') continue;
      if (node.content === 'title') this.title = this.plainText(mainArgument(node) ?? []);
      else if (definitionMacros.has(node.content)) this.define(node);
      else if (node.content === 'def') i = this.defineDef(nodes, i);
      else if (node.content === 'usepackage' || node.content === 'documentclass' || node.content === 'RequirePackage') packages++;
      else if (frontMatterMacros.has(node.content)) this.note(`\\${node.content}`, lineOf(node), 'the derivation’s authors are the group members who write it');
    }
    if (packages > 0) this.leftOut.set('preamble', { what: 'the preamble (\\documentclass, \\usepackage)', lines: [], count: packages, detail: 'page set-up has no place in a derivation' });
  }

  private define(node: Ast.Macro): void {
    const args = node.args ?? [];
    // \newcommand*{\name}[n][default]{body}: arguments are starred, name, count, default, body.
    const nameArg = args.find((a) => a.openMark === '{' && a.content.length > 0);
    const nameNode = nameArg?.content.find((n) => n.type === 'macro') as Ast.Macro | undefined;
    const body = args.at(-1);
    if (!nameNode || !body || body === nameArg) return;
    const brackets = args.filter((a) => a.openMark === '[');
    const count = brackets[0] ? Number(this.plainText(brackets[0].content)) : 0;
    if (node.content === 'DeclareMathOperator') {
      this.macros.set(nameNode.content, { name: nameNode.content, argumentCount: 0, optionalDefault: null, body: `\\operatorname{${this.argumentText(body)}}` });
      return;
    }
    this.macros.set(nameNode.content, {
      name: nameNode.content,
      argumentCount: Number.isInteger(count) && count >= 0 && count <= 9 ? count : 0,
      optionalDefault: brackets[1] ? this.argumentText(brackets[1]) : null,
      body: this.argumentText(body),
    });
  }

  /** \def\name{body} (arguments in \def's own #1#2 form are not taken). Returns the last index used. */
  private defineDef(nodes: Ast.Node[], at: number): number {
    const name = nodes[at + 1];
    const body = nodes[at + 2];
    if (name?.type === 'macro' && body?.type === 'group') {
      const text = body.position ? this.source.slice(body.position.start.offset + 1, body.position.end.offset - 1) : this.raw(body.content);
      this.macros.set(name.content, { name: name.content, argumentCount: 0, optionalDefault: null, body: text });
      return at + 2;
    }
    this.note('\\def with parameters', lineOf(nodes[at]), 'only \\def\\name{…} without parameters is expanded');
    return at;
  }

  /**
   * The source text of a run of nodes, exactly as written. A node's recorded end can stop short of
   * arguments attached to it (x^{2}), so the run ends where the next sibling or the parent's end begins.
   */
  private raw(nodes: Ast.Node[], end?: number): string {
    const first = nodes.find((n) => n.position);
    const last = [...nodes].reverse().find((n) => n.position);
    if (!first?.position || !last?.position) return '';
    return this.source.slice(first.position.start.offset, Math.max(end ?? 0, furthestEnd(last))).trim();
  }

  /** The text of an argument, from its own braces when known. */
  private argumentText(arg: Ast.Argument): string {
    if (arg.position && arg.openMark) {
      return this.source.slice(arg.position.start.offset + arg.openMark.length, arg.position.end.offset - arg.closeMark.length).trim();
    }
    return this.raw(arg.content);
  }

  /** The LaTeX inside a math node, without its delimiters ($ $, \( \), \[ \], $$ $$, \begin{…} \end{…}). */
  private mathInside(node: Ast.Node): string {
    if (!node.position) return this.raw((node as Ast.InlineMath).content ?? []);
    let text = this.source.slice(node.position.start.offset, node.position.end.offset);
    if (node.type === 'mathenv' || node.type === 'environment') {
      text = text.replace(/^\\begin\s*\{[^}]*\}/, '');
      if (/^alignat/.test(envName(node))) text = text.replace(/^\s*\{[^}]*\}/, '');
      return text.replace(/\\end\s*\{[^}]*\}\s*$/, '');
    }
    if (text.startsWith('$$')) return text.slice(2, text.endsWith('$$') ? -2 : undefined);
    if (text.startsWith('$')) return text.slice(1, text.endsWith('$') ? -1 : undefined);
    if (text.startsWith('\\(') || text.startsWith('\\[')) return text.slice(2, /\\[)\]]$/.test(text) ? -2 : undefined);
    return text;
  }

  private plainText(nodes: Ast.Node[]): string {
    const saved = this.paragraph;
    this.paragraph = [];
    this.walkInline(nodes, { marks: [] });
    const text = this.paragraph.map((i) => (i.kind === 'text' ? i.text : `$${i.latex}$`)).join('');
    this.paragraph = saved;
    return text.replace(/\s+/g, ' ').trim();
  }

  // -- blocks
  private flush(): void {
    const content = tidy(this.paragraph);
    this.paragraph = [];
    if (content.length > 0) this.blocks.push({ kind: 'paragraph', content });
  }

  private pushBlock(block: Block): void {
    this.flush();
    this.blocks.push(block);
  }

  private walkBlocks(nodes: Ast.Node[], ctx: Context): void {
    this.depth++;
    if (this.depth > 60) {
      this.note('deeply nested groups', lineOf(nodes[0]), 'nesting deeper than 60 levels is not imported');
      this.depth--;
      return;
    }
    for (let i = 0; i < nodes.length; i++) {
      const node = nodes[i]!;
      switch (node.type) {
        case 'parbreak':
          this.flush();
          break;
        case 'displaymath':
          this.displayMath(node);
          break;
        case 'mathenv':
        case 'environment':
          this.environment(node, ctx);
          break;
        case 'macro':
          if (!this.blockMacro(node)) i = this.inlineMacro(nodes, i, ctx);
          break;
        case 'verbatim':
          this.note(`\\begin{${node.env}}`, lineOf(node), leftOutEnvironments[node.env] ?? 'verbatim text is not imported');
          break;
        default:
          this.walkInline([node], ctx);
      }
    }
    this.depth--;
  }

  /** Section headings and the like; false if the macro is not one. */
  private blockMacro(node: Ast.Macro): boolean {
    const name = node.content;
    if (name in sectionLevels) {
      const base = sectionLevels[name]!;
      // With a title the title is the first heading and sections sit one level below it.
      const level = Math.min(3, Math.max(1, base + (this.hasTitle ? 1 : 0))) as 1 | 2 | 3;
      this.flush();
      const saved = this.paragraph;
      this.paragraph = [];
      this.walkInline(mainArgument(node) ?? [], { marks: [] });
      const content = tidy(this.paragraph);
      this.paragraph = saved;
      if (content.length > 0) this.blocks.push({ kind: 'heading', level, content });
      return true;
    }
    if (name === 'title') {
      const title = this.plainText(mainArgument(node) ?? []);
      this.title ??= title;
      this.hasTitle = true;
      if (title) this.pushBlock({ kind: 'heading', level: 1, content: [{ kind: 'text', text: title, marks: [] }] });
      return true;
    }
    if (name === 'maketitle' && this.title && !this.blocks.some((b) => b.kind === 'heading' && b.level === 1)) {
      this.pushBlock({ kind: 'heading', level: 1, content: [{ kind: 'text', text: this.title, marks: [] }] });
      return true;
    }
    if (runInHeadings.has(name)) {
      this.flush();
      this.walkInline(mainArgument(node) ?? [], { marks: [{ type: 'bold' }] });
      this.paragraph.push({ kind: 'text', text: ' ', marks: [] });
      return true;
    }
    if (name === 'item') {
      this.flush();
      return false;
    }
    if (name === 'input' || name === 'include' || name === 'subfile') {
      this.note(`\\${name}{${this.plainText(mainArgument(node) ?? [])}}`, lineOf(node), 'other files are not read: import each one separately');
      return true;
    }
    if (name === 'bibliography' || name === 'bibliographystyle' || name === 'printbibliography' || name === 'addbibresource') {
      this.note(`\\${name}`, lineOf(node), 'the bibliography is not imported');
      return true;
    }
    if (name === 'includegraphics') {
      this.note('\\includegraphics', lineOf(node), 'images are not imported');
      return true;
    }
    if (name === 'caption') {
      this.note('\\caption', lineOf(node), 'captions belong to figures and tables, which are not imported');
      return true;
    }
    return false;
  }

  private environment(node: Ast.Environment, ctx: Context): void {
    const name = envName(node);
    if (name in mathEnvironments) {
      this.displayMath(node, mathEnvironments[name]!);
      return;
    }
    if (name === 'itemize' || name === 'enumerate' || name === 'description') {
      this.list(node, name === 'enumerate');
      return;
    }
    if (name === 'abstract') {
      this.pushBlock({ kind: 'heading', level: this.hasTitle ? 2 : 1, content: [{ kind: 'text', text: 'Abstract', marks: [] }] });
      this.walkBlocks(node.content, ctx);
      this.flush();
      return;
    }
    const theorem = theoremLike[name.replace(/\*$/, '')];
    if (theorem) {
      this.flush();
      const label = optionalArgument(node);
      this.paragraph.push({ kind: 'text', text: theorem, marks: [{ type: 'bold' }] });
      if (label) {
        this.paragraph.push({ kind: 'text', text: ' (', marks: [] });
        this.walkInline(label, { marks: [] });
        this.paragraph.push({ kind: 'text', text: ')', marks: [] });
      }
      this.paragraph.push({ kind: 'text', text: '. ', marks: [{ type: 'bold' }] });
      this.walkBlocks(node.content, ctx);
      this.flush();
      return;
    }
    if (name in leftOutEnvironments) {
      this.flush();
      this.note(`\\begin{${name}}`, lineOf(node), leftOutEnvironments[name]!);
      return;
    }
    if (passThroughEnvironments.has(name)) {
      this.walkBlocks(node.content, ctx);
      return;
    }
    this.note(`\\begin{${name}}`, lineOf(node), 'an environment the import does not know: its text was kept as plain paragraphs');
    this.walkBlocks(node.content, ctx);
  }

  private list(node: Ast.Environment, ordered: boolean): void {
    this.flush();
    const items: Block[][] = [];
    for (const child of node.content) {
      if (child.type !== 'macro' || child.content !== 'item') {
        if (child.type !== 'whitespace' && child.type !== 'parbreak' && child.type !== 'comment') {
          // Text before the first \item: LaTeX complains; keep it as its own item.
          items.push(this.sub(() => this.walkBlocks([child], { marks: [] })));
        } else if (child.type === 'comment') this.countComment(child);
        continue;
      }
      const label = optionalArgument(child);
      const body = (child.args ?? []).at(-1)?.content ?? [];
      items.push(
        this.sub(() => {
          if (label) {
            this.walkInline(label, { marks: [{ type: 'bold' }] });
            this.paragraph.push({ kind: 'text', text: ' ', marks: [] });
          }
          this.walkBlocks(body, { marks: [] });
        }),
      );
    }
    const nonEmpty = items.filter((item) => item.length > 0);
    if (nonEmpty.length > 0) this.blocks.push({ kind: 'list', ordered, items: nonEmpty });
  }

  /** Runs a reader step into a fresh block list and returns what it produced. */
  private sub(fill: () => void): Block[] {
    const savedBlocks = this.blocks.splice(0);
    const savedParagraph = this.paragraph;
    this.paragraph = [];
    fill();
    this.flush();
    const produced = this.blocks.splice(0);
    this.blocks.push(...savedBlocks);
    this.paragraph = savedParagraph;
    return produced;
  }

  private countComment(node: Ast.Comment): void {
    this.comments++;
    const line = lineOf(node);
    if (line !== null && this.commentLines.length < MAX_LINES_LISTED) this.commentLines.push(line);
  }

  // -- math
  private mathSource(node: Ast.Node): string {
    let latex = expandMacros(this.mathInside(node), this.macros);
    const labels = latex.match(/\\label\s*\{[^{}]*\}/g);
    if (labels) {
      for (const _ of labels) this.note('\\label in equations', lineOf(node), 'equation numbers and labels are not kept (KaTeX does not number equations)');
      latex = latex.replace(/\\label\s*\{[^{}]*\}/g, '');
    }
    return latex.trim();
  }

  private displayMath(node: Ast.Node, wrapper: string | null = null): void {
    let latex = this.mathSource(node);
    if (!latex) return;
    if (wrapper) {
      if (wrapper === 'gathered' && node.type !== 'displaymath') {
        const name = envName(node as Ast.Environment);
        if (name.startsWith('multline')) this.note('\\begin{multline}', lineOf(node), 'typeset as centred lines (gathered), not as a multline');
      }
      if (wrapper === 'aligned' && /&\s*=\s*&/.test(latex)) latex = latex.replace(/&\s*=\s*&/g, '&=');
      latex = `\\begin{${wrapper}}${wrapper === 'alignedat' ? `{${this.alignatColumns(node)}}` : ''}\n${latex}\n\\end{${wrapper}}`;
    }
    this.pushBlock({ kind: 'math', latex });
  }

  private alignatColumns(node: Ast.Node): string {
    const start = node.position?.start.offset ?? 0;
    const head = /^\\begin\s*\{alignat\*?\}\s*\{(\d+)\}/.exec(this.source.slice(start, start + 64));
    return head ? head[1]! : '1';
  }

  // -- inline text
  private text(text: string, ctx: Context): void {
    if (!text) return;
    const last = this.paragraph.at(-1);
    if (last?.kind === 'text' && sameMarks(last.marks, ctx.marks)) last.text += text;
    else this.paragraph.push({ kind: 'text', text, marks: ctx.marks });
  }

  private walkInline(nodes: Ast.Node[], ctx: Context): void {
    for (let i = 0; i < nodes.length; i++) {
      const node = nodes[i]!;
      switch (node.type) {
        case 'string':
          this.text(node.content, ctx);
          break;
        case 'whitespace':
          this.text(' ', ctx);
          break;
        case 'parbreak':
          this.text(' ', ctx);
          break;
        case 'comment':
          this.countComment(node);
          if (node.leadingWhitespace) this.text(' ', ctx);
          break;
        case 'inlinemath': {
          const latex = this.mathSource(node);
          if (latex) this.paragraph.push({ kind: 'math', latex });
          break;
        }
        case 'displaymath':
        case 'mathenv':
        case 'environment':
          // A display inside a run of text (e.g. in a section title): keep it inline.
          if (node.type === 'environment' && !(envName(node) in mathEnvironments)) {
            this.walkInline(node.content, ctx);
          } else {
            const latex = this.mathSource(node);
            if (latex) this.paragraph.push({ kind: 'math', latex });
          }
          break;
        case 'group':
          this.walkInline(node.content, ctx);
          break;
        case 'verb':
          this.text(node.content, { marks: [...ctx.marks, { type: 'code' }] });
          break;
        case 'verbatim':
          this.note(`\\begin{${node.env}}`, lineOf(node), 'verbatim text is not imported');
          break;
        case 'macro':
          i = this.inlineMacro(nodes, i, ctx);
          break;
        default:
          break;
      }
    }
  }

  /** Handles the macro at nodes[i]; returns the last index it used. */
  private inlineMacro(nodes: Ast.Node[], i: number, ctx: Context): number {
    const node = nodes[i] as Ast.Macro;
    const name = node.content;
    const arg = () => mainArgument(node) ?? [];
    const withMark = (mark: Mark) => this.walkInline(arg(), { marks: [...ctx.marks.filter((m) => m.type !== mark.type), mark] });

    if (name in symbolMacros) {
      this.text(symbolMacros[name]!, ctx);
      return i;
    }
    if (name in accents) {
      // \"o or \"{o}: the argument may be attached, a following group, or the next letter.
      let base = node.args?.length ? this.plainText(arg()) : '';
      let used = i;
      if (!base) {
        const next = nodes[i + 1];
        if (next?.type === 'group') {
          base = this.plainText(next.content);
          used = i + 1;
        } else if (next?.type === 'string') {
          base = next.content[0] ?? '';
          this.text(base ? `${dotted(base)}${accents[name]}`.normalize('NFC') : '', ctx);
          this.text(next.content.slice(1), ctx);
          return i + 1;
        }
      }
      this.text(base ? `${dotted(base[0]!)}${accents[name]}${base.slice(1)}`.normalize('NFC') : '', ctx);
      return used;
    }
    const marked: Mark | null = italicMacros.has(name) ? { type: 'italic' } : boldMacros.has(name) ? { type: 'bold' } : codeMacros.has(name) ? { type: 'code' } : null;
    if (marked) {
      withMark(marked);
      return i;
    }
    if (plainMacros.has(name)) {
      this.walkInline(arg(), ctx);
      return i;
    }
    if (name === '\\' || name === 'newline') {
      this.text(' ', ctx);
      return i;
    }
    if (name === 'url') {
      const href = this.plainText(arg());
      this.text(href, { marks: [...ctx.marks, { type: 'link', href }] });
      return i;
    }
    if (name === 'href') {
      const braced = (node.args ?? []).filter((a) => a.openMark === '{');
      const href = braced[0] ? this.argumentText(braced[0]) : '';
      this.walkInline(braced[1]?.content ?? [], { marks: [...ctx.marks, { type: 'link', href }] });
      return i;
    }
    if (citeMacros.has(name)) {
      const keys = this.plainText(arg());
      this.text(`[${keys}]`, ctx);
      this.note('citations', lineOf(node), 'kept as their keys in brackets; the bibliography is not imported');
      return i;
    }
    if (refMacros.has(name)) {
      const key = this.plainText(arg());
      this.text(name === 'eqref' ? `(${key})` : key, ctx);
      this.note('cross-references (\\ref, \\eqref)', lineOf(node), 'kept as their labels; numbers are not resolved');
      return i;
    }
    if (name === 'label') {
      this.note('\\label', lineOf(node), 'labels are not kept');
      return i;
    }
    if (name === 'footnote' || name === 'footnotetext') {
      this.text(' (', ctx);
      this.walkInline(arg(), ctx);
      this.text(')', ctx);
      this.note('footnotes', lineOf(node), 'kept in parentheses where they stood');
      return i;
    }
    if (definitionMacros.has(name)) {
      this.define(node);
      return i;
    }
    if (name === 'def') return this.defineDef(nodes, i);
    if (layoutMacros.has(name)) {
      this.note('layout commands (\\noindent, \\vspace, …)', lineOf(node), 'they only arrange the printed page');
      return i;
    }
    if (frontMatterMacros.has(name)) {
      this.note(`\\${name}`, lineOf(node), 'the derivation’s authors are the group members who write it');
      return i;
    }
    if (name === 'item') {
      this.text(' ', ctx);
      this.walkInline(arg(), ctx);
      return i;
    }
    if (this.macros.has(name)) {
      // The author's own macro in running text: expand its source and read that.
      const expanded = expandMacros(this.source.slice(node.position?.start.offset ?? 0, node.position?.end.offset ?? 0), this.macros);
      if (this.depth < 40) {
        this.depth++;
        this.walkInline(parse(expanded).content, ctx);
        this.depth--;
      }
      return i;
    }
    if (this.blockMacro(node)) return i;
    this.note(`\\${name}`, lineOf(node), 'a command the import does not know: its name was left out, any text in braces after it kept');
    if (node.args?.length) this.walkInline(arg(), ctx);
    return i;
  }
}

/** Where a node's source really ends: past the arguments attached to it. */
function furthestEnd(node: Ast.Node): number {
  let end = node.position?.end.offset ?? 0;
  if (node.type === 'macro') for (const arg of node.args ?? []) {
    if (arg.position) end = Math.max(end, arg.position.end.offset);
    const last = arg.content.at(-1);
    if (last) end = Math.max(end, furthestEnd(last) + (arg.closeMark?.length ?? 0));
  }
  return end;
}

function sameMarks(a: readonly Mark[], b: readonly Mark[]): boolean {
  return a.length === b.length && a.every((m, i) => m.type === b[i]!.type && (m.type !== 'link' || (b[i] as { href?: string }).href === m.href));
}

/** Collapses runs of white space and trims the ends of a paragraph. */
function tidy(content: Inline[]): Inline[] {
  const out: Inline[] = [];
  for (const item of content) {
    if (item.kind === 'math') {
      out.push(item);
      continue;
    }
    const code = item.marks.some((m) => m.type === 'code');
    const text = code ? item.text : item.text.replace(/[ \t\r\n]+/g, ' ');
    const last = out.at(-1);
    if (last?.kind === 'text' && sameMarks(last.marks, item.marks)) last.text += text;
    else out.push({ ...item, text });
  }
  for (const item of out) if (item.kind === 'text' && !item.marks.some((m) => m.type === 'code')) item.text = typographic(item.text);
  // Spaces: none doubled across pieces, none at the ends.
  for (let i = 1; i < out.length; i++) {
    const prev = out[i - 1]!;
    const cur = out[i]!;
    if (prev.kind === 'text' && cur.kind === 'text' && prev.text.endsWith(' ') && cur.text.startsWith(' ')) cur.text = cur.text.slice(1);
  }
  const first = out[0];
  if (first?.kind === 'text') first.text = first.text.replace(/^\s+/, '');
  const last = out.at(-1);
  if (last?.kind === 'text') last.text = last.text.replace(/\s+$/, '');
  return out.filter((item) => item.kind === 'math' || item.text.length > 0);
}

/** Reads a .tex file's text into blocks, with everything that was not imported listed. */
export function readLatex(source: string): ImportedLatex {
  return new LatexReader(source).read();
}
