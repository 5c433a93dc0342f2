import ReactMarkdown, { type Components, type UrlTransform } from "react-markdown";

/** Our own private file route: the only image source user Markdown may show. */
const OWN_FILE = /^\/api\/files\/[1-9]\d{0,15}$/;
const LINK_PROTOCOLS = new Set(["http:", "https:", "mailto:"]);

/** Elements plain Markdown produces that we show; anything else is unwrapped to its text. */
const ALLOWED = [
  "p",
  "br",
  "strong",
  "em",
  "del",
  "code",
  "pre",
  "blockquote",
  "ul",
  "ol",
  "li",
  "hr",
  "h1",
  "h2",
  "h3",
  "h4",
  "h5",
  "h6",
  "a",
  "img",
];

export function safeLinkHref(href: string): string {
  try {
    const url = new URL(href);
    return LINK_PROTOCOLS.has(url.protocol) ? url.href : "";
  } catch {
    return "";
  }
}

export function safeImageSrc(src: string): string {
  return OWN_FILE.test(src) ? src : "";
}

const urlTransform: UrlTransform = (url, key) =>
  key === "src" ? safeImageSrc(url) : key === "href" ? safeLinkHref(url) : "";

const components: Components = {
  a: ({ href, children }) =>
    href ? (
      <a href={href} rel="noopener noreferrer nofollow" target="_blank" className="underline">
        {children}
      </a>
    ) : (
      <span>{children}</span>
    ),
  // A picture from anywhere else would make the reader's browser call that host: show the
  // alt text instead.
  img: ({ src, alt }) =>
    typeof src === "string" && src ? (
      // eslint-disable-next-line @next/next/no-img-element -- a private file behind our access check, not a static asset
      <img src={src} alt={alt ?? ""} loading="lazy" className="max-h-64 rounded" />
    ) : (
      <span>{alt ? `[${alt}]` : ""}</span>
    ),
};

/**
 * User-written Markdown (messages, quote scopes): raw HTML is shown as text, never as markup;
 * links only to http, https and mailto, opened with `rel="noopener noreferrer nofollow"`;
 * images only from our own file route (`/api/files/<id>`), else their alt text.
 */
export function Markdown({ children }: { children: string }) {
  return (
    <ReactMarkdown
      allowedElements={ALLOWED}
      unwrapDisallowed
      urlTransform={urlTransform}
      components={components}
    >
      {children}
    </ReactMarkdown>
  );
}
