// PostCSS runs Tailwind CSS 4 for every stylesheet; nothing else to configure here.
export default { plugins: { '@tailwindcss/postcss': {} } };
