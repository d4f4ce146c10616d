//! The report's style sheet and its one small script, embedded in the page (no network, no files).
//!
//! Colours: ink and paper greys, with the accents taken from the colour-blind-safe palette of
//! Okabe & Ito (2008, *Color Universal Design*): blue #0072B2, orange #E69F00, vermillion #D55E00,
//! bluish green #009E73. Normal polarity black, reversed white (the trade's convention).

/// Screen and print CSS.
pub const CSS: &str = r#"
:root{--ink:#1f2630;--muted:#58606b;--rule:#d5d9de;--paper:#fff;--tint:#f4f6f8;--blue:#0072B2;--orange:#E69F00;--verm:#D55E00;--green:#009E73}
*{box-sizing:border-box}
html{-webkit-text-size-adjust:100%}
body{margin:0;font:15px/1.5 system-ui,"DejaVu Sans",sans-serif;color:var(--ink);background:var(--paper)}
main{max-width:1280px;margin:0 auto;padding:0 24px 48px}
a{color:var(--blue)}
header.top{border-bottom:3px solid var(--ink);padding:18px 0 10px;margin-bottom:14px}
header.top h1{font-size:1.55em;margin:0 0 4px;line-height:1.2}
header.top p{margin:0;color:var(--muted);font-size:.92em}
h2{font-size:1.25em;margin:2.2em 0 .5em;padding-bottom:3px;border-bottom:1px solid var(--rule)}
h3{font-size:1.02em;margin:1.4em 0 .4em}
.summary{display:grid;grid-template-columns:minmax(0,5fr) minmax(0,6fr);gap:20px;align-items:start}
.answers{width:100%;border-collapse:collapse;font-size:.93em}
.answers th{text-align:left;vertical-align:top;width:9.5em;padding:6px 10px 6px 0;color:var(--muted);font-weight:600}
.answers td{padding:6px 0;border-bottom:1px solid var(--rule);white-space:normal}
.answers th{white-space:normal}
.answers b[data-k]{font-variant-numeric:tabular-nums}
.verdict{display:inline-block;padding:0 6px;border-radius:3px;font-size:.85em;font-weight:600;border:1px solid}
.verdict.good{color:#00684b;border-color:var(--green)}.verdict.bad{color:#9c3a00;border-color:var(--verm)}.verdict.open{color:var(--muted);border-color:var(--rule)}
.keyfigs{display:grid;grid-template-columns:1fr 1fr;gap:8px}
.keyfigs figure:first-child{grid-row:span 2}
figure{margin:10px 0}
figure svg{display:block;max-width:100%;height:auto}
figcaption{font-size:.85em;color:var(--muted)}
.keyfigs figcaption{font-size:.78em}
.caution,.warn{border-left:4px solid;padding:6px 12px;margin:12px 0;font-size:.88em}
.caution{border-color:var(--blue);background:#eef5fa}.warn{border-color:var(--orange);background:#fdf6e8}
.caution ul,.warn ul{margin:4px 0;padding-left:1.2em}
nav.toc ol{columns:3 16em;margin:4px 0;padding-left:1.4em;font-size:.93em}
.stage .method{color:var(--muted);font-size:.92em}
.stage .result{font-weight:500}
.skipped{color:#8a5200}
.figs{display:grid;grid-template-columns:repeat(auto-fit,minmax(340px,1fr));gap:14px}
details.table{margin:8px 0;border:1px solid var(--rule);border-radius:4px}
details.table>summary{cursor:pointer;padding:5px 10px;background:var(--tint);font-weight:600;font-size:.92em}
.files{font-weight:400;color:var(--muted);font-size:.92em}
.scroll{overflow-x:auto}
table{border-collapse:collapse;font-size:.82em;margin:0}
th,td{border-bottom:1px solid var(--rule);padding:3px 8px;text-align:left;white-space:nowrap}
thead th{background:var(--tint);position:sticky;top:0}
td.n{text-align:right;font-variant-numeric:tabular-nums}
.legend{font-size:.88em;color:var(--muted)}
.legend i{display:inline-block;width:10px;height:10px;border-radius:50%;margin:0 4px 0 10px;vertical-align:-1px}
.site{margin:0 0 10px}
.site h3{margin:.9em 0 .3em;font-size:.95em}
.cards{display:grid;grid-template-columns:repeat(auto-fill,minmax(250px,1fr));gap:8px}
.card{margin:0;border:1px solid var(--rule);border-radius:4px;padding:4px;background:var(--paper)}
.card>a.open{display:block}
.card figcaption{font-size:.74em;line-height:1.35}
.card .close{display:none}
.card.rejected{border-color:var(--verm);background:#fdf2ec}
.card .why{color:#9c3a00}
.card:target{position:fixed;inset:3vh 3vw;z-index:10;overflow:auto;padding:16px;box-shadow:0 0 0 100vmax rgba(20,24,30,.55)}
.card:target figcaption{font-size:1em}
.card:target .close{display:inline-block;float:right;font-size:1em}
code{font-size:.95em}
@media (max-width:900px){.summary{grid-template-columns:1fr}}
@media (max-width:600px){main{padding:0 12px 32px}body{font-size:14px}.keyfigs{grid-template-columns:1fr}.keyfigs figure:first-child{grid-row:auto}.answers th{width:7em}.figs{grid-template-columns:1fr}.cards{grid-template-columns:repeat(auto-fill,minmax(150px,1fr))}nav.toc ol{columns:1}}
@media print{
@page{size:A4;margin:14mm 12mm}
body{font-size:10pt}main{max-width:none;padding:0}
a{color:inherit;text-decoration:none}
.card:target{position:static;box-shadow:none;padding:4px}.card .close{display:none!important}
details.table>summary{background:none;padding:2px 0}
details.table{border:0}
thead th{position:static}
h2{break-after:avoid}h3{break-after:avoid}
figure,.card,tr,.answers tr,.caution,.warn{break-inside:avoid}
section.part{break-before:page}
.summary{grid-template-columns:1fr 1fr}
.cards{grid-template-columns:repeat(4,1fr)}
.scroll{overflow:visible}
th,td{white-space:normal}
}
"#;

/// Opens folded tables for printing (and folds them again after), and lets Escape close an
/// enlarged specimen.
pub const SCRIPT: &str = r#"
addEventListener('beforeprint',function(){document.querySelectorAll('details:not([open])').forEach(function(d){d.open=true;d.setAttribute('data-folded','')})});
addEventListener('afterprint',function(){document.querySelectorAll('details[data-folded]').forEach(function(d){d.open=false;d.removeAttribute('data-folded')})});
addEventListener('keydown',function(e){if(e.key==='Escape'&&location.hash.indexOf('#sp-')===0){location.hash='#specimens'}});
"#;
