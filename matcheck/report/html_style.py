"""The HTML report's style sheet, inline and scoped to ``.mc`` (a notebook cell shows the
report without restyling the notebook). System fonts only: nothing is fetched. The print
rules drop the navigation, keep charts and passages whole on a page and print links as text.
"""

STYLE = """
.mc{font-family:system-ui,-apple-system,"Segoe UI",Roboto,"Helvetica Neue",Arial,sans-serif;
color:#1b1b1b;background:#fff;line-height:1.45;max-width:1100px;margin:0 auto;padding:0 1rem}
.mc h1{font-size:1.6rem;margin:.8rem 0 .2rem}.mc h2{font-size:1.25rem;margin-top:1.6rem;
border-bottom:2px solid #1b1b1b;padding-bottom:.15rem}.mc h3{font-size:1.02rem;margin:1rem 0 .4rem}
.mc .meta,.mc .hint,.mc .small{color:#4a4a4a;font-size:.88rem}
.mc .verdict{font-size:1.08rem;font-weight:600}
.mc .legend{font-size:.85rem;border:1px solid #bbb;padding:.35rem .6rem;border-radius:4px}
.mc .band-key{display:inline-block;width:22px;height:10px;background:#e2e2e2;
border:1px dashed #8a8a8a;vertical-align:middle}
.mc nav.toc{font-size:.9rem;margin:.6rem 0}
.mc table{border-collapse:collapse;margin:.3rem 0 .8rem;font-size:.88rem}
.mc th,.mc td{border-bottom:1px solid #d4d4d4;padding:.22rem .5rem;text-align:left;
vertical-align:top}
.mc thead th{border-bottom:2px solid #555}
.mc td.num,.mc th.num{text-align:right;white-space:nowrap;font-variant-numeric:tabular-nums}
.mc td.measure{white-space:nowrap}
.mc .mark{white-space:nowrap}.mc .glyph{vertical-align:-2px;margin-right:.25rem}
.mc tr.status-differs td.measure{font-weight:700}
.mc tr:target,.mc .evidence:target,.mc .grid-box:target,.mc svg:target{outline:3px solid #1f5f99}
.mc .wide{overflow-x:auto;max-width:100%}
.mc ul.contrasts{font-size:.85rem;color:#333;margin:.2rem 0}
.mc .charts{display:flex;flex-wrap:wrap;gap:.4rem 1.2rem}
.mc figure.chart-box{margin:.2rem 0}
.mc svg.chart{max-width:100%;height:auto;font-size:11px}
.mc svg .chart-title{font-weight:700;font-size:12px}
.mc svg .row-against,.mc svg .tick{fill:#555;font-size:10px}
.mc .evidence{border-left:4px solid #8a8a8a;padding:.2rem .7rem;margin:.6rem 0}
.mc .evidence.brief{margin:.15rem 0;padding:0 .7rem;border-left-style:dotted}
.mc .evidence.brief .line{margin:.1rem 0;font-size:.88rem}
.mc .evidence-head{margin:.1rem 0;font-size:.9rem}
.mc .side-by-side{display:grid;grid-template-columns:1fr 1fr;gap:.8rem}
.mc .side{border:1px solid #ccc;padding:.3rem .6rem;border-radius:3px}
.mc .side-head{margin:0;font-size:.82rem;color:#333}
.mc .passage{margin:.3rem 0;font-family:Georgia,"Times New Roman",serif}
.mc del.removed{text-decoration:line-through 2px;background:#f6dcdc;color:#5a1010}
.mc ins.added{text-decoration:underline 2px;font-weight:600;background:#dce9f6;color:#0d3158}
.mc del.changed,.mc ins.changed{text-decoration:none;border:1.5px dotted #333;
background:#f3ecd2;padding:0 2px}
.mc .only{border-bottom:2px solid #333}
.mc .absent{font-style:italic;color:#555}
.mc details>summary{cursor:pointer;color:#333;font-size:.9rem;margin:.3rem 0}
.mc footer{margin:2rem 0 1rem;border-top:1px solid #bbb}
.mc .note{font-size:.85rem;color:#444}
.mc article.study{border-top:3px double #555;margin-top:2rem}
@media print{
.mc .wide{overflow:visible}
.mc{max-width:none;padding:0;font-size:10pt}.mc nav.toc{display:none}
.mc a{color:inherit;text-decoration:none}
.mc figure.chart-box,.mc .evidence,.mc tr,.mc .grid-box{break-inside:avoid}
.mc h2,.mc h3{break-after:avoid}
.mc del.removed,.mc ins.added,.mc del.changed,.mc ins.changed{
-webkit-print-color-adjust:exact;print-color-adjust:exact}
.mc details>*{display:block}
}
"""
