//! The layers of the crates whose insides have an architecture to keep: each top-level
//! module has a rank, and a module may use only modules of its own rank or lower — never
//! one above it ("no import running back up a layer"). Between top-level modules, and
//! between the files of a crate that asks for it, there must be no import circle.

use std::collections::{BTreeMap, BTreeSet};

use super::graph::{ModPath, ModuleGraph};

/// One crate's layer table, lowest rank first.
pub struct Layering {
    pub name: &'static str,
    /// The crate's `src` folder, from the workspace root.
    pub src: &'static str,
    /// Top-level modules by rank: a module may use its own rank's and lower ranks'.
    /// The crate root (`lib.rs`) stands above every rank.
    pub ranks: &'static [&'static [&'static str]],
    /// Whether import circles between single files are breaches too.
    pub no_file_circles: bool,
}

/// The server's stages in the order a record travels, on the store, on the taxa; the
/// edges (HTTP, command line, demo) on top. The app's screens on its data layer.
pub const LAYERINGS: &[Layering] = &[
    Layering {
        name: "wrackline-server",
        src: "server/src",
        ranks: &[
            &["taxa", "settings"],
            &["store"],
            &["intake", "people"],
            &["duplicates", "notify"],
            &["review"],
            &["protect"],
            &["export", "assess"],
            &["arrival", "import", "state"],
            &["handlers", "router", "error", "cli", "commands", "demo"],
        ],
        no_file_circles: false,
    },
    Layering { name: "wrackline-app", src: "app/src", ranks: &[&["data"], &["screens"]], no_file_circles: true },
];

fn rank_of(layering: &Layering, top: &str) -> Option<usize> {
    if top.is_empty() {
        return Some(layering.ranks.len()); // the crate root
    }
    layering.ranks.iter().position(|rank| rank.contains(&top))
}

fn shown(module: &ModPath) -> String {
    if module.is_empty() { "the crate root".to_owned() } else { module.join("::") }
}

/// The breaches of `layering` in `graph`, in words.
pub fn check(layering: &Layering, graph: &ModuleGraph) -> Vec<String> {
    let mut breaches = Vec::new();
    let tops: BTreeSet<String> = graph.files.keys().map(ModuleGraph::top).collect();
    for top in &tops {
        if rank_of(layering, top).is_none() {
            breaches.push(format!("{}: top-level module `{top}` has no place in the layer table", layering.name));
        }
    }
    let edges = graph.top_level_edges();
    for ((from, to), example) in &edges {
        if let (Some(a), Some(b)) = (rank_of(layering, from), rank_of(layering, to))
            && b > a
        {
            breaches.push(format!(
                "{}: `{from}` (rank {a}) uses `{to}` (rank {b}), a layer above it (in {})",
                layering.name,
                shown(example)
            ));
        }
    }
    let top_edges: BTreeSet<(ModPath, ModPath)> =
        edges.keys().map(|(a, b)| (vec![a.clone()], vec![b.clone()])).filter(|(a, _)| !a[0].is_empty()).collect();
    for circle in circles(&top_edges) {
        breaches.push(format!("{}: import circle between modules: {}", layering.name, describe_circle(&circle)));
    }
    if layering.no_file_circles {
        for circle in circles(&graph.file_edges()) {
            breaches.push(format!("{}: import circle between files: {}", layering.name, describe_circle(&circle)));
        }
    }
    breaches
}

fn describe_circle(circle: &[ModPath]) -> String {
    circle.iter().map(shown).collect::<Vec<_>>().join(" → ")
}

/// Every strongly connected group of two or more nodes (Tarjan's algorithm), each
/// listed in order; a circle exists exactly when such a group does.
pub fn circles(edges: &BTreeSet<(ModPath, ModPath)>) -> Vec<Vec<ModPath>> {
    let mut next: BTreeMap<&ModPath, Vec<&ModPath>> = BTreeMap::new();
    for (a, b) in edges {
        next.entry(a).or_default().push(b);
        next.entry(b).or_default();
    }
    let nodes: Vec<&ModPath> = next.keys().copied().collect();
    let mut state = Tarjan {
        next: &next,
        index: BTreeMap::new(),
        low: BTreeMap::new(),
        stack: Vec::new(),
        groups: Vec::new(),
        counter: 0,
    };
    for node in nodes {
        if !state.index.contains_key(node) {
            state.visit(node);
        }
    }
    state.groups.into_iter().filter(|g| g.len() > 1).map(|g| g.into_iter().cloned().collect()).collect()
}

struct Tarjan<'a> {
    next: &'a BTreeMap<&'a ModPath, Vec<&'a ModPath>>,
    index: BTreeMap<&'a ModPath, usize>,
    low: BTreeMap<&'a ModPath, usize>,
    stack: Vec<&'a ModPath>,
    groups: Vec<Vec<&'a ModPath>>,
    counter: usize,
}

impl<'a> Tarjan<'a> {
    fn visit(&mut self, node: &'a ModPath) {
        self.index.insert(node, self.counter);
        self.low.insert(node, self.counter);
        self.counter += 1;
        self.stack.push(node);
        for &target in &self.next[node] {
            if !self.index.contains_key(target) {
                self.visit(target);
                let low = self.low[node].min(self.low[target]);
                self.low.insert(node, low);
            } else if self.stack.contains(&target) {
                let low = self.low[node].min(self.index[target]);
                self.low.insert(node, low);
            }
        }
        if self.low[node] == self.index[node] {
            let mut group = Vec::new();
            while let Some(top) = self.stack.pop() {
                group.push(top);
                if top == node {
                    break;
                }
            }
            group.reverse();
            self.groups.push(group);
        }
    }
}

/// The layer table with the uses between top-level modules, for `cargo xtask tidy`.
pub fn describe(layering: &Layering, graph: &ModuleGraph) -> String {
    let edges = graph.top_level_edges();
    let mut text = format!("{} (lowest layer first):\n", layering.name);
    for (rank, modules) in layering.ranks.iter().enumerate() {
        for module in *modules {
            let uses: Vec<&str> = edges.keys().filter(|(from, _)| from == module).map(|(_, to)| to.as_str()).collect();
            text.push_str(&format!(
                "  {rank} {module:<10} uses {}\n",
                if uses.is_empty() { "-".to_owned() } else { uses.join(", ") }
            ));
        }
    }
    text
}

#[cfg(test)]
mod tests {
    use super::*;

    fn graph(uses: &[(&str, &str)]) -> ModuleGraph {
        let mut graph = ModuleGraph::default();
        for (from, to) in uses {
            for name in [from, to] {
                let module: ModPath = name.split("::").filter(|s| !s.is_empty()).map(str::to_owned).collect();
                graph.files.insert(module, std::path::PathBuf::new());
            }
            let path = |name: &str| name.split("::").filter(|s| !s.is_empty()).map(str::to_owned).collect::<ModPath>();
            graph.uses.entry(path(from)).or_default().insert(path(to));
        }
        graph
    }

    const TOY: Layering = Layering {
        name: "toy",
        src: "",
        ranks: &[&["store"], &["intake", "people"], &["handlers"]],
        no_file_circles: true,
    };

    #[test]
    fn a_use_downward_or_sideways_is_allowed() {
        assert!(check(&TOY, &graph(&[("handlers", "intake"), ("intake", "store"), ("intake", "people")])).is_empty());
    }

    #[test]
    fn a_use_running_up_a_layer_is_a_breach() {
        let breaches = check(&TOY, &graph(&[("store::rows", "intake::images")]));
        assert_eq!(breaches.len(), 1, "{breaches:?}");
        assert!(breaches[0].contains("`store` (rank 0) uses `intake` (rank 1)"), "{breaches:?}");
    }

    #[test]
    fn a_module_missing_from_the_table_is_a_breach() {
        let breaches = check(&TOY, &graph(&[("handlers", "stray")]));
        assert!(breaches.iter().any(|b| b.contains("`stray` has no place")), "{breaches:?}");
    }

    #[test]
    fn circles_between_modules_and_files_are_found() {
        let breaches = check(&TOY, &graph(&[("intake", "people"), ("people", "intake")]));
        assert!(breaches.iter().any(|b| b.contains("circle between modules")), "{breaches:?}");
        let breaches =
            check(&TOY, &graph(&[("intake::a", "intake::b"), ("intake::b", "intake::c"), ("intake::c", "intake::a")]));
        assert!(
            breaches.iter().any(|b| b.contains("circle between files: intake::a → intake::b → intake::c")),
            "{breaches:?}"
        );
    }

    #[test]
    fn a_child_using_its_parent_is_no_circle() {
        assert!(check(&TOY, &graph(&[("intake", "intake::images"), ("intake::images", "intake")])).is_empty());
    }
}
