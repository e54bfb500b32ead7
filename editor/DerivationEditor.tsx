'use client';
// The derivation's text: a Tiptap editor bound to the derivation's Y.Doc, with a small toolbar
// for authors. Reviewers and readers get the same view, not editable.
import { EditorContent, useEditor, useEditorState, type Editor } from '@tiptap/react';
import { useEffect, useMemo } from 'react';
import { BlockTools } from './blocks/BlockTools';
import { derivationExtensions, type EditorBinding } from './extensions';
import './editor.css';
import './blocks/blocks.css';
import './offscreen.css';

export interface DerivationEditorProps {
  binding: EditorBinding;
  editable: boolean;
  /** Accessible name of the text area, e.g. the derivation's title. */
  label: string;
  onReady?: (editor: Editor) => void;
}

interface ToolState {
  paragraph: boolean;
  heading: boolean;
  bold: boolean;
  italic: boolean;
  bulletList: boolean;
  orderedList: boolean;
  math: boolean;
}

function Tool({ label, keys, active, onPress }: { label: string; keys?: string; active?: boolean; onPress: () => void }) {
  return (
    <button
      type="button"
      aria-pressed={active === undefined ? undefined : active}
      title={keys ? `${label} (${keys})` : label}
      onMouseDown={(event) => event.preventDefault()}
      onClick={onPress}
      className="rounded border border-transparent px-2 py-0.5 text-sm text-ink-soft hover:border-rule hover:text-ink aria-pressed:border-accent/40 aria-pressed:bg-accent-soft aria-pressed:text-ink"
    >
      {label}
    </button>
  );
}

function Toolbar({ editor }: { editor: Editor }) {
  const state = useEditorState<ToolState>({
    editor,
    selector: ({ editor: e }) => ({
      paragraph: e.isActive('paragraph'),
      heading: e.isActive('heading'),
      bold: e.isActive('bold'),
      italic: e.isActive('italic'),
      bulletList: e.isActive('bulletList'),
      orderedList: e.isActive('orderedList'),
      math: e.isActive('mathInline') || e.isActive('mathDisplay'),
    }),
  });
  const run = (command: (chain: ReturnType<Editor['chain']>) => ReturnType<Editor['chain']>) => () => command(editor.chain().focus()).run();
  return (
    <div role="toolbar" aria-label="Formatting" className="flex flex-wrap items-center gap-1 border-b border-rule px-2 py-1">
      <Tool label="Text" active={state.paragraph} onPress={run((c) => c.setParagraph())} />
      <Tool label="Heading" keys="Ctrl+Alt+2" active={state.heading} onPress={run((c) => c.toggleHeading({ level: 2 }))} />
      <span className="mx-1 h-4 w-px bg-rule" aria-hidden="true" />
      <Tool label="Bold" keys="Ctrl+B" active={state.bold} onPress={run((c) => c.toggleBold())} />
      <Tool label="Italic" keys="Ctrl+I" active={state.italic} onPress={run((c) => c.toggleItalic())} />
      <span className="mx-1 h-4 w-px bg-rule" aria-hidden="true" />
      <Tool label="List" active={state.bulletList} onPress={run((c) => c.toggleBulletList())} />
      <Tool label="Numbered" active={state.orderedList} onPress={run((c) => c.toggleOrderedList())} />
      <span className="mx-1 h-4 w-px bg-rule" aria-hidden="true" />
      <Tool label="Inline math" keys="type $…$" onPress={run((c) => c.insertInlineMath())} />
      <Tool label="Display math" keys="type $$ and a space" onPress={run((c) => c.insertDisplayMath())} />
      <span className="mx-1 h-4 w-px bg-rule" aria-hidden="true" />
      <BlockTools editor={editor} />
      <Tool label="Trajectory plot" onPress={run((c) => c.insertTrajectoryPlot())} />
    </div>
  );
}

export function DerivationEditor({ binding, editable, label, onReady }: DerivationEditorProps) {
  // The binding (doc, provider, user) is fixed for the editor's life; the page remounts on change.
  const extensions = useMemo(() => derivationExtensions(binding), [binding]);
  const editor = useEditor(
    {
      extensions,
      editable,
      immediatelyRender: false,
      editorProps: {
        attributes: {
          class: 'derivation-text',
          'aria-label': label,
          'aria-multiline': 'true',
          role: 'textbox',
          'aria-readonly': editable ? 'false' : 'true',
        },
      },
    },
    [extensions],
  );

  useEffect(() => {
    if (!editor) return;
    editor.setEditable(editable);
    editor.view.dom.setAttribute('aria-readonly', editable ? 'false' : 'true');
  }, [editor, editable]);

  useEffect(() => {
    if (editor && onReady) onReady(editor);
  }, [editor, onReady]);

  return (
    <div className="rounded border border-rule bg-white/70">
      {editor && editable && <Toolbar editor={editor} />}
      <EditorContent editor={editor} />
    </div>
  );
}
