import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vite";

export default defineConfig(({ isSsrBuild }) => ({
  // The server bundle starts at the Express app, so the API and the route
  // modules share one module graph in production.
  build: isSsrBuild ? { rollupOptions: { input: "./app/app.server.ts" } } : {},
  plugins: [tailwindcss(), !process.env.VITEST && reactRouter()],
  resolve: { tsconfigPaths: true },
  server: { host: "127.0.0.1" },
  optimizeDeps: {
    include: ["react", "react-dom", "react-router", "zod", "date-fns"],
    exclude: [
      "pg",
      "drizzle-orm",
      "@node-rs/argon2",
      "lucia",
      "@lucia-auth/adapter-drizzle",
      "resend",
    ],
  },
}));
