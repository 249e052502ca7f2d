/** How rich-text comments look (editor and stored HTML alike), without global CSS. */
export const RICH_TEXT = [
  "[&_p]:my-1 [&_ul]:my-1 [&_ul]:list-disc [&_ul]:pl-5 [&_ol]:my-1 [&_ol]:list-decimal [&_ol]:pl-5",
  "[&_code]:rounded-sm [&_code]:bg-paper [&_code]:px-1 [&_code]:font-mono [&_code]:text-[0.85em]",
  "[&_pre]:my-1 [&_pre]:overflow-x-auto [&_pre]:rounded-sm [&_pre]:bg-paper [&_pre]:p-2 [&_pre_code]:p-0",
  "[&_blockquote]:border-l-2 [&_blockquote]:border-rule [&_blockquote]:pl-2 [&_blockquote]:text-muted",
  "[&_a]:text-accent [&_a]:underline [&_.mention]:rounded-sm [&_.mention]:bg-accent-soft [&_.mention]:px-0.5 [&_.mention]:font-medium [&_.mention]:text-accent",
  "[&_strong]:font-semibold",
].join(" ");
