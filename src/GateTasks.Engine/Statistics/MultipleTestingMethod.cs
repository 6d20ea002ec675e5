namespace GateTasks.Engine.Statistics;

/// <summary>How a family of p-values is corrected for being tested together.</summary>
internal enum MultipleTestingMethod
{
    /// <summary>Holm (1979) step-down; controls the family-wise error rate under any dependence.</summary>
    Holm,

    /// <summary>Benjamini &amp; Hochberg (1995) step-up; controls the false discovery rate (independent or positively dependent tests).</summary>
    BenjaminiHochberg,

    /// <summary>Bonferroni: each p-value times the number of tests; family-wise error rate, more conservative than Holm.</summary>
    Bonferroni,
}
