/**
 * Marks the page as scripted (`html.js`) so controls that only work with JavaScript show, and
 * the notes for readers without it hide (src/styles/site.css: needs-js, nojs-only).
 */
document.documentElement.classList.add('js');
