package dev.winnow.jobs;

import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.JobStore.Resource;
import dev.winnow.store.PanelStore;

import java.util.ArrayList;
import java.util.List;

/**
 * What each kind of job reads and writes, which decides the order jobs run in when several workers share the queue:
 * a job waits for every earlier unfinished job that writes something it touches or touches something it writes.
 * <ul>
 *   <li>a panel upload writes its panel (and, through it, extends the factors built on it);</li>
 *   <li>a factor build writes its factor and reads its panel, so builds on one panel run in parallel with each
 *       other but wait for earlier uploads of the panel, and later uploads wait for them;</li>
 *   <li>a loadings history reads its panel;</li>
 *   <li>an external series upload touches everything: it may rebuild any factor that subtracts it as its risk-free
 *       rate, on any panel, and such uploads are rare;</li>
 *   <li>any other kind touches everything.</li>
 * </ul>
 */
public final class JobResources {
    private final FactorStore factors;
    private final PanelStore panels;

    public JobResources(FactorStore factors, PanelStore panels) {
        this.factors = factors;
        this.panels = panels;
    }

    public static String panel(String name) {
        return "panel:" + name;
    }

    public static String factor(String name) {
        return "factor:" + name;
    }

    public List<Resource> of(JobParams params) {
        List<Resource> resources = new ArrayList<>();
        if (params instanceof JobParams.PanelUpload upload) {
            resources.add(Resource.writes(panel(upload.panel())));
        } else if (params instanceof JobParams.LoadingsHistory history) {
            resources.add(Resource.reads(panel(history.panel())));
        } else if (params instanceof JobParams.FactorBuild build) {
            resources.add(Resource.writes(factor(build.factor())));
            FactorVersionRecord v = factors.version(build.factor(), build.version()).orElse(null);
            if (v == null || v.panelId() == null) {
                resources.add(Resource.writes(Resource.EVERYTHING));
            } else {
                panels.find(v.panelId()).ifPresentOrElse(p -> resources.add(Resource.reads(panel(p.name()))),
                        () -> resources.add(Resource.writes(Resource.EVERYTHING)));
            }
        } else {
            resources.add(Resource.writes(Resource.EVERYTHING));
        }
        return resources;
    }
}
