/** @type {import('next').NextConfig} */
const nextConfig = {
  // Logger files are posted to a server action; the default 1 MB body limit is too small for a month of data.
  // proxy.ts sees every request: Next buffers a request body for it and, past proxyClientMaxBodySize
  // (default 10 MB), hands the route a truncated body. Uploads may be 201 MB (app/api/traces/route.ts);
  // one MB more lets the route itself see an over-limit body and answer 413.
  experimental: { serverActions: { bodySizeLimit: "50mb" }, proxyClientMaxBodySize: "202mb" },
  // The engine's worker pool loads its own worker file; keep piscina out of the server bundle.
  serverExternalPackages: ["piscina"],
};

module.exports = nextConfig;
