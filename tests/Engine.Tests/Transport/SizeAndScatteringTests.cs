using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Engine.Tests.Transport;

/// <summary>Sample size, channel shares and the mean-free-path accumulation.</summary>
public class SizeAndScatteringTests
{
    private static readonly ConductivityOptions Intrinsic = new()
    {
        Umklapp = new UmklappScattering(),
        GrueneisenParameter = 1.5,
        PointDefects = new PointDefectScattering { MassVarianceGamma = 2e-4 },
    };

    [Fact]
    public void Kappa_rises_monotonically_with_sample_size_and_saturates_at_bulk()
    {
        // Matthiessen: a longer L lowers every mode's rate, so kappa(L) rises; at L much longer than the
        // intrinsic mean free paths it reaches the bulk (no-boundary) value (Ziman, Electrons and
        // Phonons, ch. 8; common practice).
        var sample = BulkSample.Uniform(3, 6);
        var intrinsic = Intrinsic with { CheckMeshConvergence = false };
        var bulk = Kappa.Compute(Crystals.FccCentral(), sample, intrinsic, 300).AtReference.KappaWPerMK;
        var lengthsNm = Enumerable.Range(0, 7).Select(i => Math.Pow(10, i)).ToArray(); // 1 nm .. 1 mm
        var kappas = lengthsNm.Select(l => Kappa.Compute(Crystals.FccCentral(), sample,
            intrinsic with { Boundary = new BoundaryScattering { LengthNm = l } }, 300).AtReference.KappaWPerMK).ToArray();
        for (var i = 1; i < kappas.Length; i++)
        {
            Assert.True(kappas[i] > kappas[i - 1], $"kappa({lengthsNm[i]} nm) = {kappas[i]} must exceed kappa({lengthsNm[i - 1]} nm) = {kappas[i - 1]}");
        }

        Assert.True(kappas[^1] < bulk);
        Approx.Equal(bulk, kappas[^1], 0.01, "1 mm against bulk");
        Assert.True(kappas[0] < 0.1 * bulk, $"1 nm: {kappas[0]} vs bulk {bulk}");
    }

    [Fact]
    public void A_finite_crystal_takes_its_boundary_length_from_its_smallest_extent()
    {
        var options = Intrinsic with { Boundary = new BoundaryScattering() };
        var result = Kappa.Compute(Crystals.ScalarSimpleCubic(), FiniteSample.Create(8, 8, 5), options, 300);
        Approx.Equal(5 * Crystals.SpacingNm, result.BoundaryLengthNm, 1e-12, "L_eff");
        var given = Kappa.Compute(Crystals.ScalarSimpleCubic(), FiniteSample.Create(8, 8, 5),
            Intrinsic with { Boundary = new BoundaryScattering { LengthNm = 5 * Crystals.SpacingNm } }, 300);
        Approx.Equal(given.AtReference.KappaWPerMK, result.AtReference.KappaWPerMK, 1e-12, "same as the length given");
    }

    [Fact]
    public void Channel_shares_add_up_to_one_and_follow_the_dominant_channel()
    {
        var options = Intrinsic with { Boundary = new BoundaryScattering { LengthNm = 100 } };
        var shares = Kappa.Compute(Crystals.FccCentral(), BulkSample.Uniform(3, 6), options, 20, 300).SharesAtReference;
        Approx.Equal(1.0, shares.Boundary + shares.PointDefect + shares.Umklapp + shares.Constant, 1e-12, "sum of shares");
        Assert.Equal(0.0, shares.Constant);
        Assert.True(shares.Umklapp > shares.PointDefect && shares.Umklapp > shares.Boundary, $"at 300 K Umklapp dominates: {shares}");

        var cold = Kappa.Compute(Crystals.FccCentral(), BulkSample.Uniform(3, 6), options, 300, 20).SharesAtReference;
        Assert.True(cold.Boundary > cold.Umklapp, $"at 20 K the 100 nm boundary dominates: {cold}");

        var single = Kappa.Compute(Crystals.FccCentral(), BulkSample.Uniform(3, 6), new ConductivityOptions { Constant = new ConstantScattering(3) }, 300).SharesAtReference;
        Assert.Equal(1.0, single.Constant, 12);
    }

    [Fact]
    public void Cumulative_kappa_by_mean_free_path_rises_to_the_total()
    {
        var options = Intrinsic with { Boundary = new BoundaryScattering { LengthNm = 1e4 }, MeanFreePathTable = true };
        var result = Kappa.Compute(Crystals.FccCentral(), BulkSample.Uniform(3, 6), options, 300);
        var rows = result.CumulativeByMeanFreePath;
        Assert.NotEmpty(rows);
        for (var i = 1; i < rows.Length; i++)
        {
            Assert.True(rows[i].MeanFreePathNm > rows[i - 1].MeanFreePathNm);
            Assert.True(rows[i].CumulativeKappaWPerMK >= rows[i - 1].CumulativeKappaWPerMK);
        }

        Approx.Equal(result.AtReference.KappaWPerMK, rows[^1].CumulativeKappaWPerMK, 1e-10, "all modes counted");
        Assert.Equal(1.0, rows[^1].CumulativeFraction, 12);

        // A boundary of 10 um: no mode's mean free path |v| tau exceeds L_eff = 10^4 nm.
        var atL = rows.First(r => r.MeanFreePathNm >= 1e4 * (1 + 1e-9));
        Assert.Equal(1.0, atL.CumulativeFraction, 12);
        Assert.Empty(Kappa.Compute(Crystals.FccCentral(), BulkSample.Uniform(3, 6), Intrinsic, 300).CumulativeByMeanFreePath);
    }

    [Fact]
    public void Isotope_scattering_from_a_natural_composition_lowers_kappa()
    {
        // A one-site model with the natural-silicon mass and its isotopes against the same model
        // without them: the isotope channel can only add scattering.
        var silicon = CrystalModel.Create(Lattice.FaceCentredCubic(0.4), [new Site("Si", "Si", Vec3.Zero, 28.085)], [new ShellSpring("Si", "Si", 1, 10)]);
        var boundary = new BoundaryScattering { LengthNm = 1e4 };
        var pure = Kappa.Compute(silicon, BulkSample.Uniform(3, 6), new ConductivityOptions { Boundary = boundary }, 300).AtReference.KappaWPerMK;
        var natural = Kappa.Compute(silicon, BulkSample.Uniform(3, 6), new ConductivityOptions
        {
            Boundary = boundary,
            PointDefects = new PointDefectScattering { Sites = [new SiteComposition { SiteLabel = "Si", NaturalElement = "Si" }] },
        }, 300);
        Assert.True(natural.AtReference.KappaWPerMK < pure);
        Approx.Equal(2.01e-4, natural.MassVarianceGamma, 0.01, "Gamma used");
    }
}
