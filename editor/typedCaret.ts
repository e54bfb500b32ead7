// A character typed into an empty line sometimes comes back from Chromium with the caret before it
// (seen as "$$ " typed into a fresh paragraph read as "$ $", about one time in four on a busy
// page): ProseMirror takes the caret from the DOM after reading what was typed. Here a plain
// insertion into an empty textblock always leaves the caret after the typed text, as typing does
// everywhere else.
import { Extension } from '@tiptap/core';
import { Plugin, PluginKey, TextSelection } from '@tiptap/pm/state';

export const TypedTextCaret = Extension.create({
  name: 'typedTextCaret',
  // Last, so that input rules read the typed text first.
  priority: 1,

  addProseMirrorPlugins() {
    return [
      new Plugin({
        key: new PluginKey('typedTextCaret'),
        props: {
          handleTextInput(view, from, to, text, typed) {
            if (from !== to || text.length === 0) return false;
            if (view.state.doc.resolve(from).parent.content.size !== 0) return false;
            const tr = typed();
            if (!tr.selection.empty || tr.selection.from !== from) return false;
            view.dispatch(tr.setSelection(TextSelection.create(tr.doc, from + text.length)));
            return true;
          },
        },
      }),
    ];
  },
});
