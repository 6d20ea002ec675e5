using GateTasks.Engine.Demo;

namespace GateTasks.Engine.Tests.Demo;

public sealed class ToyDiphotonSimulationTests
{
    private static DemoEventChunk Generate(DemoScenarioParameters p, int events, int seed)
    {
        var chunk = new DemoEventChunk(events);
        new ToyDiphotonSimulation(p, seed).Generate(chunk, events);
        return chunk;
    }

    [Fact]
    public void EverySelectedEventIsInsideTheAcceptance()
    {
        var p = DemoScenarioParameters.FullSimulation;
        var chunk = Generate(p, 100_000, 11);

        for (var i = 0; i < chunk.Count; i++)
        {
            Assert.InRange(Math.Abs(chunk.EtaLead[i]), 0, p.EtaAcceptance);
            Assert.InRange(Math.Abs(chunk.EtaSublead[i]), 0, p.EtaAcceptance);
            // E_T = E / cosh η; the float32 rounding of the stored columns allows a 1e-5 relative slack.
            var etLead = chunk.EnergyLead[i] / Math.Cosh(chunk.EtaLead[i]);
            var etSublead = chunk.EnergySublead[i] / Math.Cosh(chunk.EtaSublead[i]);
            Assert.True(etSublead > p.MinTransverseEnergy * (1 - 1e-5), $"event {i}: E_T {etSublead}");
            Assert.True(etLead >= etSublead * (1 - 1e-5), $"event {i}: leading photon has the smaller E_T");
            Assert.InRange(chunk.CosThetaStar[i], 0f, 1f);
            Assert.InRange(chunk.JetCount[i], 0, p.MaxJets);
            Assert.InRange(chunk.LeadConverted[i], 0, 1);
            Assert.True(chunk.Weight[i] > 0);
        }
    }

    [Fact]
    public void DiscreteColumnsAndWeightsHaveTheirIntendedFractions()
    {
        var p = DemoScenarioParameters.FullSimulation;
        var chunk = Generate(p, 100_000, 12);

        // Gamma(k, rate k) has mean 1 and standard deviation 1/√k; the mean of 10⁵ draws is within 5 standard errors.
        var meanWeight = chunk.Weight.Average(w => (double)w);
        Assert.InRange(meanWeight, 1 - 5 / Math.Sqrt(p.WeightShape * chunk.Count), 1 + 5 / Math.Sqrt(p.WeightShape * chunk.Count));
        // The conversion probability rises from 0.18 (η = 0) to 0.40 (|η| = 2.5); the average lies in between.
        var convertedFraction = chunk.LeadConverted.Average();
        Assert.InRange(convertedFraction, p.ConversionProbabilityCentral, p.ConversionProbabilityEdge);
        // Every multiplicity 0..MaxJets occurs.
        for (var n = 0; n <= p.MaxJets; n++)
        {
            Assert.Contains(n, chunk.JetCount);
        }
    }

    [Fact]
    public void PeakPositionAndWidthFollowTheResolutionFormula()
    {
        // Signal only, negligible natural width, no angular smearing, one stochastic term for all photons:
        // then the m_γγ spread is the calorimeter energy resolution alone.
        var p = DemoScenarioParameters.FullSimulation with
        {
            SignalFraction = 1.0,
            ResonanceWidth = 1e-4,
            EtaSmearing = 0,
            PhiSmearing = 0,
            ConvertedStochasticScale = 1.0,
        };
        var chunk = Generate(p, 100_000, 13);

        // Per photon σ/E = a/√E ⊕ b/E ⊕ c (Review of Particle Physics, "Calorimetry" section: stochastic, noise and
        // constant terms in quadrature). From m² = 2·E1·E2·(1 − cos α) at fixed opening angle, first-order error
        // propagation gives σ_m/m = ½·√((σ1/E1)² + (σ2/E2)²) (common practice). Evaluated at each event's energies;
        // e.g. both photons at 47.5 GeV: σ/E = √(0.01/47.5 + 0.0625/47.5² + 0.007²) = 0.01695, σ_m = 1.139 GeV.
        var m = p.ResonanceMass;
        var expectedVariance = 0.0;
        for (var i = 0; i < chunk.Count; i++)
        {
            var r1 = p.RelativeEnergyResolution(chunk.EnergyLead[i], false);
            var r2 = p.RelativeEnergyResolution(chunk.EnergySublead[i], false);
            expectedVariance += m * m / 4 * (r1 * r1 + r2 * r2);
        }
        var expectedSigma = Math.Sqrt(expectedVariance / chunk.Count);
        Assert.InRange(expectedSigma, 0.85, 1.15); // boosted photons are harder than 47.5 GeV, so below 1.139

        var (mean, sigma) = WindowMoments(chunk.MassGg, chunk.Count, m - 6 * expectedSigma, m + 6 * expectedSigma);

        // Position: the mass is unbiased to first order; 0.05 GeV is ~15 standard errors of the mean.
        Assert.InRange(mean, m - 0.05, m + 0.05);
        // Width: loose 5 % (second-order terms, resolution evaluated at measured instead of true energies).
        Assert.InRange(sigma / expectedSigma, 0.95, 1.05);
    }

    [Fact]
    public void DriftedSampleHasAWiderCoreAndAThinnedTail()
    {
        var faithful = Generate(DemoScenarioParameters.FullSimulation, 200_000, 21);
        var drifted = Generate(DemoScenarioParameters.Drifted, 200_000, 22);

        var (_, faithfulSigma) = WindowMoments(faithful.MassGg, faithful.Count, 92, 98);
        var (_, driftedSigma) = WindowMoments(drifted.MassGg, drifted.Count, 92, 98);
        Assert.True(driftedSigma > 1.03 * faithfulSigma, $"core std {driftedSigma} vs {faithfulSigma}");

        // Dropping a fraction t of the events above the threshold turns a tail fraction f into (1 − t)·f / (1 − t·f).
        var threshold = DemoScenarioParameters.Drifted.TailThinningMassThreshold;
        var t = DemoScenarioParameters.Drifted.TailThinningFraction;
        var f = faithful.MassGg.Take(faithful.Count).Count(x => x > threshold) / (double)faithful.Count;
        var g = drifted.MassGg.Take(drifted.Count).Count(x => x > threshold) / (double)drifted.Count;
        var expected = (1 - t) * f / (1 - t * f);
        var standardError = Math.Sqrt(expected * (1 - expected) / drifted.Count + f * (1 - f) / faithful.Count);
        Assert.InRange(g, expected - 5 * standardError, expected + 5 * standardError);
    }

    [Fact]
    public void ChunkedGenerationContinuesTheSameStream()
    {
        var whole = Generate(DemoScenarioParameters.FullSimulation, 3_000, 31);
        var simulation = new ToyDiphotonSimulation(DemoScenarioParameters.FullSimulation, 31);
        var part = new DemoEventChunk(1_000);
        for (var c = 0; c < 3; c++)
        {
            simulation.Generate(part, 1_000);
            Assert.Equal(whole.EnergyLead.AsSpan(c * 1_000, 1_000).ToArray(), part.EnergyLead);
            Assert.Equal(whole.JetCount.AsSpan(c * 1_000, 1_000).ToArray(), part.JetCount);
        }
        Assert.Equal(3_000, simulation.Selected);
        Assert.True(simulation.Candidates > simulation.Selected);
    }

    [Fact]
    public void OutOfRangeParametersAreRefused()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() =>
            new ToyDiphotonSimulation(DemoScenarioParameters.FullSimulation with { SignalFraction = 1.5 }, 1));
        Assert.Throws<ArgumentOutOfRangeException>(() =>
            new ToyDiphotonSimulation(DemoScenarioParameters.FullSimulation with { MassMax = 50 }, 1));
        Assert.Throws<ArgumentOutOfRangeException>(() =>
            new ToyDiphotonSimulation(DemoScenarioParameters.FullSimulation with { TailThinningFraction = 1 }, 1));
    }

    [Fact]
    public void ResolutionFormulaAddsTheThreeTermsInQuadrature()
    {
        // σ/E = a/√E ⊕ b/E ⊕ c (Review of Particle Physics, "Calorimetry" section), worked by hand at E = 100 GeV:
        // a/√E = 0.10/10 = 0.01, b/E = 0.25/100 = 0.0025, c = 0.007 → √(1e-4 + 6.25e-6 + 4.9e-5) = √1.5525e-4 = 0.012459936.
        var p = DemoScenarioParameters.FullSimulation;
        Assert.Equal(0.012459936, p.RelativeEnergyResolution(100, false), 8);
        // Converted: a → 1.25·a = 0.125 → √(1.5625e-4 + 6.25e-6 + 4.9e-5) = √2.115e-4 = 0.014543040.
        Assert.Equal(0.014543040, p.RelativeEnergyResolution(100, true), 8);
    }

    private static (double Mean, double Sigma) WindowMoments(float[] values, int count, double low, double high)
    {
        double n = 0, sum = 0, sumSquares = 0;
        for (var i = 0; i < count; i++)
        {
            double v = values[i];
            if (v <= low || v >= high)
            {
                continue;
            }
            n++;
            sum += v;
            sumSquares += v * v;
        }
        var mean = sum / n;
        return (mean, Math.Sqrt(sumSquares / n - mean * mean));
    }
}
