/** @type {import("next").NextConfig} */
const nextConfig = {
  // mysql2 loads optional native bits at run time, and pdfkit reads its font metrics
  // from its own folder: bundling either breaks that.
  serverExternalPackages: ["mysql2", "pdfkit"],
  poweredByHeader: false,
};

export default nextConfig;
