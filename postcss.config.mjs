// PostCSS runs Tailwind CSS 4 for every stylesheet; nothing else to configure here.
const config = { plugins: { '@tailwindcss/postcss': {} } };

export default config;
