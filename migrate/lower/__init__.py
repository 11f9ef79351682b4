"""Lowering: rewrite each task class's Java into one core form before the lift rules match it.

Users write one meaning in many surface forms: a field set in setup() or at its declaration, a
counting loop or a for-each, a field used as a scratch local, a stack trace printed in a catch.
Each rule here is a meaning-preserving rewrite of the javalang tree of one task class (mapper,
reducer, combiner, partitioner), so the lift rules only ever see one form of each meaning. The rules work on a
copy of the class's tree: the file's own tree (javac's checks, the review) is left as written.

Every rewrite keeps the source positions of the code it replaces, so hand work and comments still
point at the user's lines, and records what it did (`ClassInfo.lowered`) for the report's notes.
"""
from __future__ import annotations

import copy

from migrate.java.index import ClassIndex, ClassInfo
from migrate.lower import (boxing, branches, builders, configured, counter_books, fields, logging, loops, map_updates, names,
                           record_locals, record_maps, side_outputs, value_helpers)

TASK_ROLES = {"mapper", "reducer", "combiner", "partitioner"}

# Order matters: boxing and names first (`this.x` is x for the rules after), logging (it hides reads of
# fields), helpers handed the values (their loops are reduce()'s loops for the rules after), counts
# kept through a helper object as a Map, counts added to a Map in one spelling, unused side outputs (their setup() and cleanup() lines), branches that are the same
# (logging no longer tells them apart), then objects configured where made (a configured format
# is still a constant), then fields, then loops, then records (a Map of records combined in the
# mapper becomes a record per update, then every record local is one local per field, loops
# already for-each), then builders (a builder appended in a loop stays a builder).
RULES = (boxing.boxing_constructors, names.this_fields, names.var_types, logging.drop_logging, value_helpers.value_helpers,
         counter_books.counter_books, map_updates.map_updates,
         side_outputs.unused_side_outputs,
         branches.same_branches, fields.fields_used_as_locals, configured.configured_objects, fields.setup_constants,
         loops.iterator_loops, loops.while_counters, loops.counting_loops,
         record_maps.record_maps, record_locals.record_locals, builders.builders_as_strings)


def lower_task_classes(index: ClassIndex) -> None:
    """Lower every mapper, reducer and combiner class of the index, in place of its tree."""
    for cls in index:  # first: value classes, whose fields' starting values the task rules read
        if "writable" in cls.roles and not cls.roles & TASK_ROLES:
            cls.node = copy.deepcopy(cls.node)
            cls.lowered = boxing.boxing_constructors(cls, index) + names.this_fields(cls, index)
    for cls in index:
        if cls.roles & TASK_ROLES:
            lower_class(cls, index)


def lower_class(cls: ClassInfo, index: ClassIndex | None = None) -> list[tuple[int, str]]:
    original = cls.node
    cls.node = copy.deepcopy(original)
    done: list[tuple[int, str]] = []
    for rule in RULES:
        try:
            done += rule(cls, index)
        except (AttributeError, TypeError, ValueError, KeyError, IndexError, StopIteration, RecursionError) as exc:
            # a rule that meets a shape it was not written for must not stop the batch: the class is
            # lifted as written (whatever the lift rules cannot read becomes hand work)
            cls.node, cls.combined_records = copy.deepcopy(original), []
            done = [(cls.line_start, f"not lowered ({rule.__module__.rsplit('.', 1)[-1]}: {type(exc).__name__})")]
            break
    cls.lowered = done
    return done
