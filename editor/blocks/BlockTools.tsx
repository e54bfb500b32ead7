'use client';
// Inserting checked steps from the editor's toolbar: a flow block, or a claim block of a kind.
import type { Editor } from '@tiptap/core';
import { useId } from 'react';
import type { ClaimKind } from '@/flow/types';
import { KIND_CHOICES } from './views';

export function BlockTools({ editor }: { editor: Editor }) {
  const id = useId();
  return (
    <span className="inline-flex items-center gap-1" role="group" aria-label="Checked steps">
      <button
        type="button"
        title="Insert a flow block: couplings, parameters, convention, beta functions and rates"
        onMouseDown={(event) => event.preventDefault()}
        onClick={() => editor.chain().focus().insertFlowBlock().run()}
        className="rounded border border-transparent px-2 py-0.5 text-sm text-ink-soft hover:border-rule hover:text-ink"
      >
        Flow block
      </button>
      <label htmlFor={id} className="sr-only">
        Insert a claim block
      </label>
      <select
        id={id}
        value=""
        onChange={(event) => {
          const kind = event.currentTarget.value as ClaimKind | '';
          if (kind) editor.chain().focus().insertClaimBlock(kind).run();
        }}
        className="rounded border border-transparent bg-transparent px-1 py-0.5 text-sm text-ink-soft hover:border-rule hover:text-ink"
      >
        <option value="">Claim…</option>
        {KIND_CHOICES.map((choice) => (
          <option key={choice.kind} value={choice.kind}>
            {choice.label}
          </option>
        ))}
      </select>
    </span>
  );
}
