import { describe, expect, it } from "vitest";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { Markdown } from "@/components/ui/markdown";

const render = (md: string) => renderToStaticMarkup(createElement(Markdown, null, md));

describe("Markdown: user text rendered safely", () => {
  it("renders ordinary Markdown", () => {
    const html = render("**Flow** is *low*.\n\n- one\n- two\n\n`code`");
    expect(html).toContain("<strong>Flow</strong>");
    expect(html).toContain("<em>low</em>");
    expect(html).toContain("<li>one</li>");
    expect(html).toContain("<code>code</code>");
  });

  it("shows raw HTML as text, never as markup", () => {
    const html = render(
      'Hi <img src="http://other.host/p.png" onerror="alert(1)"> <script>alert(1)</script> <iframe src="https://other.host"></iframe>',
    );
    expect(html).not.toMatch(/<img|<script|<iframe/i);
    expect(html).toContain("&lt;script&gt;");
  });

  it.each([
    "![pixel](http://other.host/pixel.png)",
    "![pixel](https://other.host/pixel.png)",
    "![pixel](//other.host/pixel.png)",
    "![pixel](/api/files/12/../../../evil)",
    "![pixel](/api/files/12?x=1)",
    "![pixel](/api/files/abc)",
    "![pixel](/_next/image?url=http://other.host/p.png)",
    "![pixel](data:image/svg+xml;base64,PHN2Zz4=)",
    "![pixel](javascript:alert(1))",
    "![pixel][ref]\n\n[ref]: http://other.host/pixel.png",
  ])("shows the alt text instead of a remote image: %j", (md) => {
    const html = render(md);
    expect(html).not.toContain("<img");
    expect(html).not.toContain("other.host");
    expect(html).toContain("[pixel]");
  });

  it("shows an image from our own file route", () => {
    const html = render("![loop sketch](/api/files/42)");
    expect(html).toContain('<img src="/api/files/42" alt="loop sketch"');
  });

  it("gives http, https and mailto links rel=noopener noreferrer nofollow", () => {
    for (const href of [
      "https://example.org/pump",
      "http://example.org/valve",
      "mailto:someone@example.org",
    ]) {
      const html = render(`[see](${href})`);
      expect(html).toContain(`href="${href}"`);
      expect(html).toContain('rel="noopener noreferrer nofollow"');
    }
    const auto = render("<https://example.org/auto>");
    expect(auto).toContain('href="https://example.org/auto"');
    expect(auto).toContain('rel="noopener noreferrer nofollow"');
  });

  it.each([
    "[x](javascript:alert(1))",
    "[x](JAVASCRIPT:alert(1))",
    "[x](vbscript:msgbox(1))",
    "[x](data:text/html,<script>alert(1)</script>)",
    "[x](file:///etc/passwd)",
    "[x](/relative/path)",
    "[x](//other.host/x)",
  ])("drops a link with any other scheme, keeping its text: %j", (md) => {
    const html = render(md);
    expect(html).not.toContain("<a");
    expect(html).not.toContain("href");
    expect(html).toContain("x");
  });
});
