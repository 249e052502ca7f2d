"use client";
import Mention from "@tiptap/extension-mention";
import { EditorContent, ReactRenderer, useEditor, useEditorState, type Editor, type JSONContent } from "@tiptap/react";
import StarterKit from "@tiptap/starter-kit";
import { useEffect, useRef, useState } from "react";
import { MentionList, type MentionItem, type MentionListHandle } from "./mention-list";

export type { Editor, JSONContent };
const SAFE_LINK = /^(https?:\/\/|mailto:)/i;

/**
 * A Tiptap editor limited to what the server accepts (paragraphs, bold, italic, code, strike,
 * links, lists, code blocks, quotes, line breaks and @mentions of manuscript members).
 */
export function useCommentEditor(members: MentionItem[], initial?: JSONContent | null, label = "Comment", autofocus = false) {
  const people = useRef(members);
  useEffect(() => {
    people.current = members;
  });
  return useEditor({
    immediatelyRender: false,
    autofocus: autofocus ? "end" : false,
    content: initial ?? "",
    extensions: [
      StarterKit.configure({
        heading: false,
        horizontalRule: false,
        underline: false,
        link: { openOnClick: false, autolink: true, protocols: ["mailto"], isAllowedUri: (url) => SAFE_LINK.test(url) },
      }),
      // eslint-disable-next-line react-hooks/refs -- Tiptap calls `items` as the user types, never during render; the ref keeps the member list current without rebuilding the editor
      Mention.configure({
        HTMLAttributes: { class: "mention" },
        suggestion: {
          items: ({ query }) => people.current.filter((m) => m.label.toLowerCase().includes(query.toLowerCase())).slice(0, 6),
          render: () => {
            let view: ReactRenderer<MentionListHandle> | null = null;
            let unmount: (() => void) | null = null;
            const close = () => {
              unmount?.();
              unmount = null;
              view?.destroy();
              view = null;
            };
            return {
              onStart: (props) => {
                view = new ReactRenderer(MentionList, { props, editor: props.editor });
                unmount = props.mount(view.element);
              },
              onUpdate: (props) => view?.updateProps(props),
              onKeyDown: (props) => {
                if (props.event.key === "Escape") {
                  close();
                  return true;
                }
                return view?.ref?.onKeyDown(props) ?? false;
              },
              onExit: close,
            };
          },
        },
      }),
    ],
    editorProps: {
      attributes: { "aria-label": label, "aria-multiline": "true", role: "textbox", class: "comment-body min-h-16 px-2.5 py-2 text-sm focus:outline-none" },
    },
  });
}

function Tool({ on, label, children, onClick }: { on: boolean; label: string; children: React.ReactNode; onClick: () => void }) {
  return (
    <button
      type="button"
      aria-label={label}
      aria-pressed={on}
      title={label}
      onMouseDown={(e) => e.preventDefault()}
      onClick={onClick}
      className={`h-7 min-w-7 rounded-sm px-1.5 text-xs ${on ? "bg-accent text-white" : "hover:bg-paper"}`}
    >
      {children}
    </button>
  );
}

/** Toolbar + editable area. */
export function CommentEditor({ editor }: { editor: Editor | null }) {
  const [linkOpen, setLinkOpen] = useState(false);
  const [href, setHref] = useState("https://");
  const active = useEditorState({
    editor,
    selector: ({ editor: e }) =>
      e
        ? {
            bold: e.isActive("bold"),
            italic: e.isActive("italic"),
            code: e.isActive("code"),
            bullet: e.isActive("bulletList"),
            ordered: e.isActive("orderedList"),
            link: e.isActive("link"),
            block: e.isActive("codeBlock"),
          }
        : null,
  });
  if (!editor) return <div className="h-24 animate-pulse rounded-sm border border-rule bg-paper" aria-hidden />;
  const c = () => editor.chain().focus();
  const applyLink = () => {
    if (SAFE_LINK.test(href.trim())) {
      c().extendMarkRange("link").setLink({ href: href.trim() }).run();
      setLinkOpen(false);
    }
  };
  return (
    <div className="rounded-sm border border-rule bg-white focus-within:border-accent">
      <div className="flex flex-wrap items-center gap-0.5 border-b border-rule px-1 py-0.5" role="toolbar" aria-label="Formatting">
        <Tool label="Bold" on={!!active?.bold} onClick={() => c().toggleBold().run()}>
          <b>B</b>
        </Tool>
        <Tool label="Italic" on={!!active?.italic} onClick={() => c().toggleItalic().run()}>
          <i>I</i>
        </Tool>
        <Tool label="Code" on={!!active?.code} onClick={() => c().toggleCode().run()}>
          <code>{"<>"}</code>
        </Tool>
        <Tool label="Bullet list" on={!!active?.bullet} onClick={() => c().toggleBulletList().run()}>
          • list
        </Tool>
        <Tool label="Numbered list" on={!!active?.ordered} onClick={() => c().toggleOrderedList().run()}>
          # list
        </Tool>
        <Tool label="Code block" on={!!active?.block} onClick={() => c().toggleCodeBlock().run()}>
          {"{ }"}
        </Tool>
        <Tool label={active?.link ? "Remove link" : "Link"} on={!!active?.link} onClick={() => (active?.link ? c().unsetLink().run() : setLinkOpen((o) => !o))}>
          link
        </Tool>
        <span className="ml-auto pr-1 text-[11px] text-muted">@ to mention</span>
      </div>
      {linkOpen ? (
        <div className="flex items-center gap-1 border-b border-rule px-2 py-1 text-xs">
          <input
            aria-label="Link address"
            className="min-w-0 flex-1 rounded-sm border border-rule px-1.5 py-0.5"
            value={href}
            onChange={(e) => setHref(e.target.value)}
            onKeyDown={(e) => {
              if (e.key === "Enter") {
                e.preventDefault();
                applyLink();
              }
            }}
          />
          <button type="button" className="rounded-sm border border-rule px-2 py-0.5" onClick={applyLink}>
            Apply
          </button>
          {!SAFE_LINK.test(href.trim()) ? <span className="text-bad">http, https or mailto only</span> : null}
        </div>
      ) : null}
      <EditorContent editor={editor} />
    </div>
  );
}
