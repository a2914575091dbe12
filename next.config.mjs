/** @type {import("next").NextConfig} */
const nextConfig = {
  // mysql2 loads optional native bits at run time; bundling it breaks that.
  serverExternalPackages: ["mysql2"],
  poweredByHeader: false,
};

export default nextConfig;
