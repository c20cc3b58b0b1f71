"""Statistics of a study's learners' data: effect sizes, equivalence, attrition, reliability.

Each module holds one published method, with its source beside it (docs/references.md):
``effects`` (Hedges' g, Glass's Δ, the Cox index, the WWC bands), ``equivalence`` (Student's
t-test and TOST on pooled variance), ``attrition`` (the WWC attrition boundary),
``reliability`` (KR-20, Cronbach's α with Feldt's interval, item statistics, ceiling and
floor, Spearman–Brown), ``power`` (achieved power) and ``diagnosis`` (why a result may be
null). Nothing here reads files or renders reports.
"""
