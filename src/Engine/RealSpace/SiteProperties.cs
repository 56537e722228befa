using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.RealSpace;

/// <summary>
/// Mass and spring factor of every site of a block: the crystal's own (ordered), one random
/// configuration of a <see cref="Disorder"/>, or its virtual crystal (every substituted site gets the
/// mean mass and the mean spring factor). A spring between sites with factors g_i and g_j is scaled
/// by g_i g_j, where g = sqrt(f) for a substitute with spring factor f; a bend of three sites as a
/// whole by (g_i g_j g_k)^(2/3) (<see cref="BendsInBlock"/>).
/// </summary>
internal sealed record SiteProperties(double[] MassKg, double[] SpringScale, int[] Substituted)
{
    /// <summary>The crystal as it is.</summary>
    public static SiteProperties Ordered(RealSpaceLattice lattice)
    {
        var masses = new double[lattice.Sites];
        for (var s = 0; s < masses.Length; s++)
        {
            masses[s] = lattice.Crystal.MassesKg[lattice.BasisOf[s]];
        }

        var scale = new double[lattice.Sites];
        Array.Fill(scale, 1.0);
        return new SiteProperties(masses, scale, new int[lattice.Sites]);
    }

    /// <summary>
    /// The virtual crystal of the disorder: each substituted basis site gets (1 - c) m + c m' and the
    /// spring scale (1 - c) + c sqrt(f), so a spring's mean over configurations, K ((1 - c) + c sqrt(f))^2
    /// per substituted end, is kept (common practice, no source). c is the fraction the configurations
    /// really have, round(c N) / N of the sample's N sites of that basis label, so the virtual crystal
    /// has their composition (the given c when c N is whole).
    /// </summary>
    public static SiteProperties VirtualCrystal(RealSpaceLattice lattice, Disorder disorder)
    {
        var p = Ordered(lattice);
        foreach (var sub in disorder.Substitutions)
        {
            var basis = lattice.Crystal.Model.SiteIndex(sub.SiteLabel);
            var host = lattice.Crystal.MassesKg[basis];
            var sites = lattice.BasisSites[basis] * lattice.ImagesPerSite;
            var c = sites > 0 ? (double)SubstitutedCount(sub.Concentration, sites) / sites : sub.Concentration;
            var mass = ((1 - c) * host) + (c * CompiledCrystal.KgFromAmu(sub.MassAmu));
            var scale = (1 - c) + (c * Math.Sqrt(sub.SpringFactor));
            for (var s = 0; s < lattice.Sites; s++)
            {
                if (lattice.BasisOf[s] == basis)
                {
                    p.MassKg[s] = mass;
                    p.SpringScale[s] = scale;
                }
            }
        }

        return p;
    }

    /// <summary>The number of a basis label's <paramref name="sites"/> substituted at concentration c: the nearest whole number to c N, halves up.</summary>
    private static long SubstitutedCount(double concentration, long sites) =>
        (long)Math.Round(concentration * sites, MidpointRounding.AwayFromZero);

    /// <summary>
    /// These per-basis values on another block of the same crystal (a Bloch block unfolded for the
    /// kernel polynomial method). Only for properties that are the same on every site of a basis
    /// label (the ordered crystal, a virtual crystal); a random configuration has no Bloch block.
    /// </summary>
    public SiteProperties OnBlock(RealSpaceLattice from, RealSpaceLattice to)
    {
        var basisMass = new double[to.Crystal.Sites];
        var basisScale = new double[to.Crystal.Sites];
        for (var s = 0; s < from.Sites; s++)
        {
            basisMass[from.BasisOf[s]] = MassKg[s];
            basisScale[from.BasisOf[s]] = SpringScale[s];
        }

        var masses = new double[to.Sites];
        var scale = new double[to.Sites];
        for (var s = 0; s < to.Sites; s++)
        {
            masses[s] = basisMass[to.BasisOf[s]];
            scale[s] = basisScale[to.BasisOf[s]];
        }

        return new SiteProperties(masses, scale, new int[to.Sites]);
    }

    /// <summary>
    /// Configuration <paramref name="index"/>: on each substituted basis site, round(c N) of its N
    /// block sites chosen uniformly (a partial Fisher-Yates shuffle), so c = 0 and c = 1 give the two
    /// ordered crystals exactly.
    /// </summary>
    public static SiteProperties Random(RealSpaceLattice lattice, Disorder disorder, int index)
    {
        var p = Ordered(lattice);
        var rng = new SplitMix((ulong)disorder.Seed, (ulong)index);
        for (var k = 0; k < disorder.Substitutions.Length; k++)
        {
            var sub = disorder.Substitutions[k];
            var basis = lattice.Crystal.Model.SiteIndex(sub.SiteLabel);
            var candidates = new List<int>();
            for (var s = 0; s < lattice.Sites; s++)
            {
                if (lattice.BasisOf[s] == basis)
                {
                    candidates.Add(s);
                }
            }

            var chosen = (int)SubstitutedCount(sub.Concentration, candidates.Count);
            var mass = CompiledCrystal.KgFromAmu(sub.MassAmu);
            var scale = Math.Sqrt(sub.SpringFactor);
            for (var i = 0; i < chosen; i++)
            {
                var j = i + (int)rng.Below((ulong)(candidates.Count - i));
                (candidates[i], candidates[j]) = (candidates[j], candidates[i]);
                var s = candidates[i];
                p.MassKg[s] = mass;
                p.SpringScale[s] = scale;
                p.Substituted[s] = k + 1;
            }
        }

        return p;
    }

    /// <summary>SplitMix64 (Steele, Lea and Flood, OOPSLA 2014): a fast, reproducible stream per (seed, configuration).</summary>
    private struct SplitMix(ulong seed, ulong stream)
    {
        private ulong _state = (seed * 0x9E3779B97F4A7C15UL) ^ ((stream + 1) * 0xD1B54A32D192ED03UL);

        public ulong Next()
        {
            _state += 0x9E3779B97F4A7C15UL;
            var z = _state;
            z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
            z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
            return z ^ (z >> 31);
        }

        /// <summary>Uniform in [0, n) by rejection (no modulo bias).</summary>
        public ulong Below(ulong n)
        {
            var limit = ulong.MaxValue - (ulong.MaxValue % n);
            ulong x;
            do
            {
                x = Next();
            }
            while (x >= limit);

            return x % n;
        }
    }
}
