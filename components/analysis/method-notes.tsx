// How the numbers in the report were made, with the published sources of each method.
import { MOVED_SPECIMEN_NOTE } from "@/lib/analysis/sentences";
export function MethodNotes() {
  return (
    <section className="panel p-4 space-y-3 text-sm break-inside-avoid-page" aria-labelledby="method-h">
      <h2 id="method-h" className="font-semibold">Method notes</h2>
      <ul className="list-disc pl-5 space-y-1.5">
        <li>
          <strong>Outcome.</strong> Each specimen placement is scored at every done inspection; only the score of record counts.
          A score shows rust when it has any spot, any rusted area or weeping. Time to first rust is the interval
          (last clean inspection, first rusted inspection] in days since the trial start, from the times inspections were done;
          a specimen never seen rusted is right-censored at its last clean inspection. Time to first weeping is read the same way
          from the inspections with weeping.
        </li>
        <li>
          <strong>Moved specimens.</strong> {MOVED_SPECIMEN_NOTE} In the estimates and tests each later placement enters at the move
          (delayed entry, i.e. left truncation: at risk only between the move and its last inspection).
        </li>
        <li>
          <strong>Curves.</strong> Turnbull&apos;s nonparametric maximum-likelihood estimate for interval-censored data (with the moved
          specimens&apos; truncation handled by Turnbull&apos;s self-consistency algorithm), drawn with each
          drop at the right end of its interval; no confidence band is drawn for it. Kaplan–Meier on right-endpoint times with
          Greenwood variance and log-transformed 95 % limits; the median&apos;s interval is read off those limits (Brookmeyer–Crowley).
          Medians follow R&apos;s rule: where the curve sits exactly at one half, the median is the midpoint to the next drop.
        </li>
        <li>
          <strong>Tests.</strong> k-group log-rank test on right-endpoint times, which places each first rust at the inspection where it
          was seen; pairwise log-rank tests with Holm&apos;s step-down adjustment. Treatments and material classes are compared with the
          log-rank test stratified by chamber (within each chamber, then combined), so jars at different humidities are not pooled;
          chambers, and chamber × treatment groups, are compared unstratified. Fisher&apos;s exact test (r × 2) of rusted by the last
          inspection; Kruskal–Wallis test of the final rusted area. All two-sided, α = 0.05.
        </li>
        <li>
          <strong>Scorer agreement.</strong> Cohen&apos;s κ between the scorer of record and a blind second scorer on the rust / no-rust
          call of the same photos (the call that defines first rust: any spot, any rusted area or weeping); then κ on ASTM D610
          grades (0–10), unweighted and quadratic-weighted; described with Landis and Koch&apos;s bands.
        </li>
        <li>
          <strong>Colour estimate.</strong> A scorer may run a colour estimate of the rusted area and accept it, correct it with marks or
          reject it; the score keeps the estimate beside it and whether it was normalised. Pixels are classified in CIELAB (D65) as rust,
          dark rust or pale weeping droplets by hue, chroma and lightness windows that are Rustline&apos;s own choice (no published
          threshold exists). When the colour card&apos;s grey patch is marked, white balance and exposure are normalised first: one gain
          per channel in linear light (IEC 61966-2-1 decoding) brings the patch to neutral grey of its stated lightness. A clipped or
          coloured patch is refused. <em>Validated on:</em> the demo generator&apos;s synthetic specimen faces, including faces under shifted
          light of known gains (the normalised colours return to within about one ΔE*ab unit, and the estimate to within 5 % of its
          value under the original light) and synthetic dark-crust and droplet spots. <em>Not validated on:</em> real cameras (their
          own colour processing and tone curves are not one gain per channel), mixed or uneven lighting across the face, glare, or real
          patina and corrosion products; on real photos treat the estimate as a starting point for the scorer&apos;s marks.
        </li>
        <li>Implementations are checked against R&apos;s survival package (survfit, survdiff), fisher.test and p.adjust on published data sets.</li>
      </ul>
      <h3 className="font-medium">Sources</h3>
      <ol className="list-decimal pl-5 space-y-1 text-xs">
        <li>Turnbull BW (1976). The empirical distribution function with arbitrarily grouped, censored and truncated data. J R Stat Soc B 38:290–295.</li>
        <li>Kaplan EL, Meier P (1958). Nonparametric estimation from incomplete observations. J Am Stat Assoc 53:457–481.</li>
        <li>Greenwood M (1926). The natural duration of cancer. Reports on Public Health and Medical Subjects 33. HMSO, London.</li>
        <li>Brookmeyer R, Crowley J (1982). A confidence interval for the median survival time. Biometrics 38:29–41.</li>
        <li>Mantel N (1966). Evaluation of survival data and two new rank order statistics arising in its consideration. Cancer Chemother Rep 50:163–170.</li>
        <li>Holm S (1979). A simple sequentially rejective multiple test procedure. Scand J Stat 6:65–70.</li>
        <li>Freeman GH, Halton JH (1951). Note on an exact treatment of contingency, goodness of fit and other problems of significance. Biometrika 38:141–149.</li>
        <li>Kruskal WH, Wallis WA (1952). Use of ranks in one-criterion variance analysis. J Am Stat Assoc 47:583–621.</li>
        <li>Cohen J (1960). A coefficient of agreement for nominal scales. Educ Psychol Meas 20:37–46; Landis JR, Koch GG (1977). Biometrics 33:159–174.</li>
        <li>IEC 61966-2-1:1999, Multimedia systems and equipment — Colour measurement and management — Default RGB colour space — sRGB; CIE 15:2004, Colorimetry (CIELAB).</li>
        <li>ASTM D610, Standard practice for evaluating degree of rusting on painted steel surfaces (rust grades by rusted area).</li>
        <li>Frictionless Data: Data Package and Table Schema specifications, specs.frictionlessdata.io (the export format).</li>
      </ol>
    </section>
  );
}
