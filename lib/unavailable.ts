/** The page proxy.ts answers with (status 503) while the database cannot be reached. */
export const UNAVAILABLE_HTML = `<!doctype html>
<html lang="en">
<head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Loopwright is briefly unavailable</title>
<style>body{font-family:system-ui,sans-serif;max-width:36rem;margin:4rem auto;padding:0 1rem;color:#0f172a;line-height:1.5}</style>
</head>
<body>
<h1>Loopwright is briefly unavailable</h1>
<p>We cannot reach our database just now. Nothing you saved is lost. Please try again in a minute.</p>
<p><a href="/">Try again</a></p>
</body>
</html>`;

/** No scripts, no outside resources: only the inline style above. */
export const UNAVAILABLE_CSP =
  "default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'";
